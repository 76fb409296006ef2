"use client";

import { createColumnHelper, type PaginationState, type SortingState } from "@tanstack/react-table";
import Link from "next/link";
import { useMemo, useState } from "react";

import { Button } from "@/components/ui/button";
import { ClearFiltersButton, DateFilter, FormMessage, Input, SelectFilter } from "@/components/ui/field";
import { ObserverTag } from "@/components/review/observer-tag";
import { DataTable, type ServerTableFeatures } from "@/components/ui/data-table";
import { useServerPage } from "@/components/ui/use-server-page";
import type { FlagReason } from "@/db/schema";
import { formatRelativeNumber, formatUt } from "@/lib/format/time";
import { FLAG_LABELS, FLAG_REASON_LIST } from "@/lib/review/flag-labels";
import { reviewDecisionSchema } from "@/lib/validation/review";

import { FlagChips } from "./flag-chips";

export type QueueRow = {
  id: string;
  observerId: string;
  observerName: string;
  observerCode: string;
  instrumentName: string;
  observedAt: string;
  utDate: string;
  receivedAt: string;
  groups: number;
  spots: number;
  k: number;
  scaledValue: number;
  network: { median: number; n: number } | null;
  flags: Array<{ reason: FlagReason; detail: string }>;
  lastQuery: { note: string | null; askedAt: string } | null;
};

type Tab = "submitted" | "queried";
type Page = { data: QueueRow[]; total: number; counts: Record<Tab, number> };

const SORT_PARAM: Record<string, string> = {
  observedAt: "observedAt",
  receivedAt: "receivedAt",
  observerName: "observer",
};
const column = createColumnHelper<ServerTableFeatures, QueueRow>();

export function ReviewQueue({
  observers,
  initialCounts,
}: {
  observers: Array<{ id: string; displayName: string; code: string }>;
  initialCounts: Record<Tab, number>;
}) {
  const [tab, setTab] = useState<Tab>("submitted");
  const [pagination, setPagination] = useState<PaginationState>({ pageIndex: 0, pageSize: 25 });
  const [sorting, setSorting] = useState<SortingState>([{ id: "receivedAt", desc: true }]);
  const [from, setFrom] = useState("");
  const [to, setTo] = useState("");
  const [observerId, setObserverId] = useState("");
  const [flag, setFlag] = useState("");
  // Bumped after a decision so the same query is fetched again.
  const [reload, setReload] = useState(0);
  const [selected, setSelected] = useState<Set<string>>(new Set());
  const [bulkNote, setBulkNote] = useState("");
  const [busy, setBusy] = useState(false);
  const [outcome, setOutcome] = useState<{ tone: "success" | "error"; text: string } | null>(null);

  const query = useMemo(() => {
    const sort = sorting[0] ?? { id: "receivedAt", desc: true };
    const params = new URLSearchParams({
      status: tab,
      page: String(pagination.pageIndex + 1),
      pageSize: String(pagination.pageSize),
      sort: `${SORT_PARAM[sort.id] ?? "receivedAt"}:${sort.desc ? "desc" : "asc"}`,
    });
    if (from) params.set("from", from);
    if (to) params.set("to", to);
    if (observerId) params.set("observerId", observerId);
    if (flag) params.set("flag", flag);
    return params.toString();
  }, [tab, pagination, sorting, from, to, observerId, flag]);

  const dateError = from && to && from > to ? "The end date is before the start date." : null;
  const { page, loading, error } = useServerPage<Page>({
    url: dateError ? null : `/api/v1/review/queue?${query}`,
    initial: { data: [], total: 0, counts: initialCounts },
    failure: "The queue could not be loaded.",
    refresh: reload,
  });

  // A new page, tab or filter starts with nothing ticked: a bulk accept only
  // ever covers rows the coordinator can see.
  const resetView = () => {
    setSelected(new Set());
    setPagination((p) => ({ ...p, pageIndex: 0 }));
  };

  const pageIds = useMemo(() => page.data.map((r) => r.id), [page.data]);
  const allTicked = pageIds.length > 0 && pageIds.every((id) => selected.has(id));

  const columns = useMemo(
    () => [
      column.display({
        id: "select",
        header: () => (
          <input
            type="checkbox"
            aria-label="Select every row on this page"
            className="size-4 accent-corona-600"
            checked={allTicked}
            onChange={(e) => setSelected(e.target.checked ? new Set(pageIds) : new Set())}
          />
        ),
        cell: (info) => (
          <input
            type="checkbox"
            aria-label={`Select the count of ${info.row.original.utDate} by ${info.row.original.observerName}`}
            className="size-4 accent-corona-600"
            checked={selected.has(info.row.original.id)}
            onChange={(e) =>
              setSelected((s) => {
                const next = new Set(s);
                if (e.target.checked) next.add(info.row.original.id);
                else next.delete(info.row.original.id);
                return next;
              })
            }
          />
        ),
      }),
      column.accessor("observedAt", {
        header: "Observed (UT)",
        enableSorting: true,
        cell: (info) => (
          <Link
            href={`/review/${info.row.original.id}`}
            className="font-medium text-ink-900 underline underline-offset-2 hover:text-corona-700"
          >
            {formatUt(info.getValue()).replace(" UT", "")}
          </Link>
        ),
      }),
      column.accessor("receivedAt", {
        header: "Received",
        enableSorting: true,
        // Month, day and time are enough to tell arrivals apart; the full instant is in the tooltip.
        cell: (info) => (
          <span className="text-xs text-ink-600" title={formatUt(info.getValue())}>
            {formatUt(info.getValue()).slice(5, 16)}
          </span>
        ),
      }),
      column.accessor("observerName", {
        header: "Observer",
        enableSorting: true,
        cell: (info) => <ObserverTag name={info.getValue()} code={info.row.original.observerCode} />,
      }),
      // The Queried tab makes room for the question: the instrument and 10g + s are on the count's page.
      ...(tab === "queried"
        ? []
        : [
            column.accessor("instrumentName", {
              header: "Instrument",
              enableSorting: false,
              cell: (info) => (
                <span className="block max-w-28 truncate" title={info.getValue()}>
                  {info.getValue()}
                </span>
              ),
            }),
          ]),
      column.accessor("groups", {
        header: () => <span className="normal-case">g</span>,
        enableSorting: false,
      }),
      column.accessor("spots", {
        header: () => <span className="normal-case">s</span>,
        enableSorting: false,
      }),
      ...(tab === "queried"
        ? []
        : [
            column.display({
              id: "raw",
              header: () => <span className="normal-case">10g + s</span>,
              cell: (info) => 10 * info.row.original.groups + info.row.original.spots,
            }),
          ]),
      column.accessor("scaledValue", {
        header: () => <span className="normal-case">k(10g + s)</span>,
        enableSorting: false,
        cell: (info) => (
          <span title={`k = ${info.row.original.k.toFixed(3)}`}>
            <strong className="block">{formatRelativeNumber(info.getValue())}</strong>
            <span className="block text-xs text-ink-500">k = {info.row.original.k.toFixed(2)}</span>
          </span>
        ),
      }),
      column.accessor("network", {
        header: "Day's network",
        enableSorting: false,
        cell: (info) => {
          const network = info.getValue();
          return network ? (
            <span title={`Median of ${network.n} other ${network.n === 1 ? "count" : "counts"} that UT day`}>
              <span className="block">{formatRelativeNumber(network.median)}</span>
              <span className="block text-xs text-ink-500">of {network.n}</span>
            </span>
          ) : (
            <span className="text-xs text-ink-400">no others</span>
          );
        },
      }),
      column.accessor("flags", {
        header: "Flags",
        enableSorting: false,
        cell: (info) => <FlagChips flags={info.getValue()} />,
      }),
      // While a count waits for its observer, what they were asked.
      ...(tab === "queried"
        ? [
            column.accessor("lastQuery", {
              header: "Question sent",
              enableSorting: false,
              cell: (info) => {
                const query = info.getValue();
                return query ? (
                  <span className="block w-56 whitespace-normal">
                    <span className="block text-ink-800">{query.note ?? "—"}</span>
                    <span className="block text-xs text-ink-500">{formatUt(query.askedAt)}</span>
                  </span>
                ) : (
                  <span className="text-ink-400">—</span>
                );
              },
            }),
          ]
        : []),
    ],
    [allTicked, pageIds, selected, tab],
  );

  async function acceptSelected() {
    setOutcome(null);
    const parsed = reviewDecisionSchema.safeParse({
      action: "accept",
      observationIds: [...selected],
      note: bulkNote,
    });
    if (!parsed.success) {
      setOutcome({ tone: "error", text: parsed.error.issues[0]?.message ?? "Check the selection." });
      return;
    }
    setBusy(true);
    try {
      const res = await fetch("/api/v1/review/decisions", {
        method: "POST",
        headers: { "content-type": "application/json" },
        body: JSON.stringify(parsed.data),
      });
      const body = await res.json();
      if (!res.ok) {
        const details = (body?.error?.issues ?? []).map((i: { message: string }) => i.message).join(" ");
        setOutcome({
          tone: "error",
          text: `${body?.error?.message ?? "The decision was not saved."} ${details}`.trim(),
        });
        return;
      }
      setOutcome({
        tone: "success",
        text: `${body.decided} ${body.decided === 1 ? "count" : "counts"} accepted into the series.`,
      });
      setSelected(new Set());
      setBulkNote("");
      setReload((n) => n + 1);
    } catch {
      setOutcome({ tone: "error", text: "No connection to Heliotally; nothing was changed. Try again." });
    } finally {
      setBusy(false);
    }
  }

  const filtered = Boolean(from || to || observerId || flag);
  const tabs: Array<{ id: Tab; label: string }> = [
    { id: "submitted", label: "Awaiting review" },
    { id: "queried", label: "Queried" },
  ];

  return (
    <div className="flex flex-col gap-3">
      <div role="tablist" aria-label="Queue" className="flex gap-1 border-b border-ink-100">
        {tabs.map((t) => (
          <button
            key={t.id}
            type="button"
            role="tab"
            aria-selected={tab === t.id}
            className={`-mb-px rounded-t-md border px-4 py-2 text-sm font-semibold ${
              tab === t.id
                ? "border-ink-100 border-b-white bg-white text-ink-950"
                : "border-transparent text-ink-600 hover:text-ink-900"
            }`}
            onClick={() => {
              setTab(t.id);
              setOutcome(null);
              resetView();
            }}
          >
            {t.label}{" "}
            <span className="ml-1 rounded-full bg-ink-100 px-2 py-0.5 text-xs text-ink-700">
              {page.counts[t.id]}
            </span>
          </button>
        ))}
      </div>

      <div className="flex flex-wrap items-end gap-3">
        <DateFilter
          id="queue-from"
          label="From (UT date)"
          value={from}
          onChange={(value) => {
            setFrom(value);
            resetView();
          }}
        />
        <DateFilter
          id="queue-to"
          label="To (UT date)"
          value={to}
          onChange={(value) => {
            setTo(value);
            resetView();
          }}
        />
        <SelectFilter
          id="queue-observer"
          label="Observer"
          value={observerId}
          onChange={(value) => {
            setObserverId(value);
            resetView();
          }}
          anyLabel="Every observer"
          options={observers.map((o) => ({ value: o.id, label: `${o.displayName} (${o.code})` }))}
        />
        <SelectFilter
          id="queue-flag"
          label="Flags"
          value={flag}
          onChange={(value) => {
            setFlag(value);
            resetView();
          }}
          anyLabel="Flagged or not"
          options={[
            { value: "any", label: "Any flag" },
            { value: "none", label: "No flag" },
            ...FLAG_REASON_LIST.map((reason) => ({ value: reason, label: FLAG_LABELS[reason] })),
          ]}
        />
        {filtered ? (
          <ClearFiltersButton
            onClear={() => {
              setFrom("");
              setTo("");
              setObserverId("");
              setFlag("");
              resetView();
            }}
          />
        ) : null}
      </div>

      {dateError || error ? (
        <p role="alert" className="text-sm font-medium text-caution-700">
          {dateError ?? error}
        </p>
      ) : null}

      <div className="flex flex-wrap items-center gap-3 rounded-lg border border-ink-100 bg-ink-50 px-3 py-2 text-sm">
        <span className="font-medium text-ink-800">
          {selected.size === 0 ? "Tick rows to accept several at once." : `${selected.size} selected`}
        </span>
        <Input
          aria-label="Note for the accepted counts (optional)"
          placeholder="Note for the audit trail (optional)"
          value={bulkNote}
          onChange={(e) => setBulkNote(e.target.value)}
          className="max-w-sm flex-1"
          disabled={selected.size === 0}
        />
        <Button type="button" onClick={acceptSelected} disabled={busy || selected.size === 0}>
          {busy ? "Accepting…" : selected.size ? `Accept ${selected.size} selected` : "Accept selected"}
        </Button>
      </div>
      {outcome ? <FormMessage tone={outcome.tone}>{outcome.text}</FormMessage> : null}

      <DataTable
        caption={tab === "submitted" ? "Observations awaiting review" : "Queried observations"}
        columns={columns}
        rows={page.data}
        rowCount={page.total}
        pagination={pagination}
        onPaginationChange={(next) => {
          setSelected(new Set());
          setPagination(next);
        }}
        sorting={sorting}
        onSortingChange={(next) => {
          setSorting(next.length ? next : [{ id: "receivedAt", desc: true }]);
          resetView();
        }}
        loading={loading}
        empty={
          filtered
            ? "Nothing matches these filters. Widen the dates or clear the filters."
            : tab === "submitted"
              ? "The queue is empty: every count has been decided. New counts appear here as observers log them."
              : "No queried counts. A count you query waits here until its observer sends it back."
        }
      />
    </div>
  );
}
