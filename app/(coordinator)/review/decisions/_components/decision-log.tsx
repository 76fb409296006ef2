"use client";

import { createColumnHelper, type PaginationState, type SortingState } from "@tanstack/react-table";
import Link from "next/link";
import { useMemo, useState } from "react";

import { ObserverTag } from "@/components/review/observer-tag";
import { DataTable, type ServerTableFeatures } from "@/components/ui/data-table";
import { useServerPage } from "@/components/ui/use-server-page";
import { ClearFiltersButton, DateFilter, SelectFilter } from "@/components/ui/field";
import { StatusBadge } from "@/components/status-badge";
import type { DecisionLogRow } from "@/db/queries/review";
import type { ReviewAction } from "@/db/schema";
import { ROLE_LABELS } from "@/lib/auth/roles";
import { formatUt } from "@/lib/format/time";
import { REVIEW_ACTION_WORDS } from "@/lib/review/action-labels";
import { DECISION_LOG_ACTIONS, decisionLogQuerySchema } from "@/lib/validation/review";

/** A line of the log as the route sends it (JSON: the time as ISO text). */
export type DecisionLogEntry = Omit<DecisionLogRow, "decidedAt"> & { decidedAt: string };

type Page = { data: DecisionLogEntry[]; total: number };

const ACTION_TONE: Record<ReviewAction, string> = {
  accepted: "text-meadow-700",
  queried: "text-ink-800",
  rejected: "text-caution-700",
  resubmitted: "text-corona-800",
  reopened: "text-corona-800",
};

const column = createColumnHelper<ServerTableFeatures, DecisionLogEntry>();

/** Every review decision in the network, newest first, filtered and paged on the server. */
export function DecisionLog({
  observers,
  deciders,
  initial = {},
}: {
  observers: Array<{ id: string; displayName: string; code: string }>;
  deciders: Array<{ id: string; name: string }>;
  /** Filters the page opens with (from its link). */
  initial?: { observerId?: string; action?: string };
}) {
  const [pagination, setPagination] = useState<PaginationState>({ pageIndex: 0, pageSize: 25 });
  const [sorting, setSorting] = useState<SortingState>([{ id: "decidedAt", desc: true }]);
  const [action, setAction] = useState(initial.action ?? "");
  const [observerId, setObserverId] = useState(initial.observerId ?? "");
  const [actorUserId, setActorUserId] = useState("");
  const [from, setFrom] = useState("");
  const [to, setTo] = useState("");

  // The same schema the route reads the query string with: a bad filter is
  // explained here and never sent.
  const checked = useMemo(() => {
    const sort = sorting[0] ?? { id: "decidedAt", desc: true };
    const raw: Record<string, string> = {
      page: String(pagination.pageIndex + 1),
      pageSize: String(pagination.pageSize),
      sort: `decidedAt:${sort.desc ? "desc" : "asc"}`,
    };
    if (action) raw.action = action;
    if (observerId) raw.observerId = observerId;
    if (actorUserId) raw.actorUserId = actorUserId;
    if (from) raw.from = from;
    if (to) raw.to = to;
    const parsed = decisionLogQuerySchema.safeParse(raw);
    if (!parsed.success)
      return { query: null, download: null, error: parsed.error.issues[0]?.message ?? "Check the filters." };
    // The download: every line these filters match, in this order.
    const download = new URLSearchParams(raw);
    download.delete("page");
    download.delete("pageSize");
    download.set("format", "csv");
    return {
      query: new URLSearchParams(raw).toString(),
      download: download.toString(),
      error: null,
    };
  }, [pagination, sorting, action, observerId, actorUserId, from, to]);

  const shown = useServerPage<Page>({
    url: checked.query === null ? null : `/api/v1/review/decisions?${checked.query}`,
    initial: { data: [], total: 0 },
    failure: "The Decision log could not be loaded.",
  });
  const { page, loading } = shown;
  const error = checked.error ?? shown.error;
  const firstPage = () => setPagination((p) => ({ ...p, pageIndex: 0 }));
  const filtered = Boolean(action || observerId || actorUserId || from || to);

  const columns = useMemo(
    () => [
      column.accessor("decidedAt", {
        header: "Decided (UT)",
        enableSorting: true,
        cell: (info) => (
          <span className="whitespace-nowrap">{formatUt(info.getValue()).replace(" UT", "")}</span>
        ),
      }),
      column.accessor("action", {
        header: "Decision",
        enableSorting: false,
        cell: (info) => (
          <span className={`font-semibold ${ACTION_TONE[info.getValue()]}`}>
            {REVIEW_ACTION_WORDS[info.getValue()]}
          </span>
        ),
      }),
      column.accessor("actorName", {
        header: "By",
        enableSorting: false,
        cell: (info) => (
          <span>
            <span className="block">{info.getValue() ?? "Unknown"}</span>
            <span className="block text-xs text-ink-500">{ROLE_LABELS[info.row.original.actorRole]}</span>
          </span>
        ),
      }),
      column.accessor("utDate", {
        header: "Count",
        enableSorting: false,
        cell: (info) => (
          <Link
            href={`/review/${info.row.original.observationId}`}
            className="font-medium whitespace-nowrap text-ink-900 underline underline-offset-2 hover:text-corona-700"
          >
            {info.getValue()}
          </Link>
        ),
      }),
      column.accessor("observerName", {
        header: "Observer",
        enableSorting: false,
        cell: (info) => <ObserverTag name={info.getValue()} code={info.row.original.observerCode} />,
      }),
      column.accessor("note", {
        header: "Why",
        enableSorting: false,
        cell: (info) =>
          info.getValue() ? (
            <span className="block max-w-xs whitespace-normal text-ink-800">{info.getValue()}</span>
          ) : (
            <span className="text-ink-400">—</span>
          ),
      }),
      column.accessor("currentStatus", {
        header: "Now",
        enableSorting: false,
        cell: (info) => <StatusBadge status={info.getValue()} />,
      }),
    ],
    [],
  );

  return (
    <div className="flex flex-col gap-3">
      <div className="flex flex-wrap items-end gap-3">
        <SelectFilter
          id="log-action"
          label="Decision"
          className="w-52"
          value={action}
          onChange={(value) => {
            setAction(value);
            firstPage();
          }}
          anyLabel="Every decision"
          options={DECISION_LOG_ACTIONS.map((a) => ({ value: a, label: REVIEW_ACTION_WORDS[a] }))}
        />
        <SelectFilter
          id="log-observer"
          label="Observer"
          className="w-60"
          value={observerId}
          onChange={(value) => {
            setObserverId(value);
            firstPage();
          }}
          anyLabel="Every observer"
          options={observers.map((o) => ({ value: o.id, label: `${o.displayName} (${o.code})` }))}
        />
        <SelectFilter
          id="log-actor"
          label="Decided by"
          className="w-52"
          value={actorUserId}
          onChange={(value) => {
            setActorUserId(value);
            firstPage();
          }}
          anyLabel="Anyone"
          options={deciders.map((d) => ({ value: d.id, label: d.name }))}
        />
        <DateFilter
          id="log-from"
          label="Decided from (UT)"
          value={from}
          onChange={(value) => {
            setFrom(value);
            firstPage();
          }}
        />
        <DateFilter
          id="log-to"
          label="to"
          value={to}
          onChange={(value) => {
            setTo(value);
            firstPage();
          }}
        />
        {filtered ? (
          <ClearFiltersButton
            onClear={() => {
              setAction("");
              setObserverId("");
              setActorUserId("");
              setFrom("");
              setTo("");
              firstPage();
            }}
          />
        ) : null}
        {checked.download ? (
          <a
            href={`/api/v1/review/decisions?${checked.download}`}
            className="ml-auto pb-2 text-sm font-semibold text-corona-700 underline"
            download
          >
            Download CSV
          </a>
        ) : null}
      </div>

      {error ? (
        <p role="alert" className="text-sm font-medium text-caution-700">
          {error}
        </p>
      ) : null}

      <DataTable
        caption="Review decisions, newest first"
        columns={columns}
        rows={page.data}
        rowCount={page.total}
        pagination={pagination}
        onPaginationChange={setPagination}
        sorting={sorting}
        onSortingChange={(next) => {
          setSorting(next.length ? next : [{ id: "decidedAt", desc: true }]);
          firstPage();
        }}
        loading={loading}
        empty={
          filtered
            ? "No decision matches these filters."
            : "No decisions yet. Every accept, query, rejection and reopening on the Review desk is listed here."
        }
      />
    </div>
  );
}
