"use client";

import { createColumnHelper, type PaginationState, type SortingState } from "@tanstack/react-table";
import Link from "next/link";
import { useMemo, useState } from "react";

import { DataTable, type ServerTableFeatures } from "@/components/ui/data-table";
import { useServerPage } from "@/components/ui/use-server-page";
import { Input } from "@/components/ui/field";
import { formatLocal, formatRelativeNumber, formatUt } from "@/lib/format/time";

import { StatusBadge } from "@/components/status-badge";

export type LogbookRow = {
  id: string;
  observedAt: string;
  utDate: string;
  instrumentName: string;
  seeing: number;
  groups: number;
  spots: number;
  northGroups: number | null;
  southGroups: number | null;
  k: number;
  relativeNumber: number;
  status: "submitted" | "accepted" | "queried" | "rejected";
  source: string;
  /** The observation's newest photo, if any (its thumbnail is shown). */
  photoId?: string | null;
};

type Page = { data: LogbookRow[]; total: number };

const column = createColumnHelper<ServerTableFeatures, LogbookRow>();

export function LogbookTable({ timeZone }: { timeZone: string }) {
  const [pagination, setPagination] = useState<PaginationState>({ pageIndex: 0, pageSize: 25 });
  const [sorting, setSorting] = useState<SortingState>([{ id: "observedAt", desc: true }]);
  const [from, setFrom] = useState("");
  const [to, setTo] = useState("");
  // The query a result belongs to: the table is loading while the current
  // query differs from the one whose answer is shown.

  const columns = useMemo(
    () => [
      column.accessor("observedAt", {
        header: "Observed (UT)",
        enableSorting: true,
        cell: (info) => (
          <Link
            href={`/logbook/${info.row.original.id}`}
            className="font-medium text-ink-900 underline-offset-2 hover:underline"
          >
            <span title={formatLocal(info.getValue(), timeZone)}>{formatUt(info.getValue())}</span>
          </Link>
        ),
      }),
      column.accessor("instrumentName", { header: "Instrument", enableSorting: false }),
      column.accessor("seeing", { header: "Seeing", enableSorting: false }),
      column.accessor("groups", { header: "g", enableSorting: false }),
      column.accessor("spots", { header: "s", enableSorting: false }),
      column.accessor("k", { header: "k", enableSorting: false, cell: (info) => info.getValue().toFixed(2) }),
      column.accessor("relativeNumber", {
        header: "R",
        enableSorting: false,
        cell: (info) => <strong>{formatRelativeNumber(info.getValue())}</strong>,
      }),
      column.accessor("status", {
        header: "Status",
        enableSorting: false,
        cell: (info) => <StatusBadge status={info.getValue()} />,
      }),
      column.accessor("photoId", {
        header: "Photo",
        enableSorting: false,
        cell: (info) => {
          const photoId = info.getValue();
          return photoId ? (
            <Link href={`/logbook/${info.row.original.id}`} aria-label="Open the observation with its photo">
              {/* eslint-disable-next-line @next/next/no-img-element -- a private thumbnail behind a signed redirect */}
              <img
                src={`/api/v1/photos/${photoId}/image?variant=thumbnail`}
                alt=""
                loading="lazy"
                className="size-9 rounded bg-ink-900 object-cover"
              />
            </Link>
          ) : null;
        },
      }),
    ],
    [timeZone],
  );

  const dateError = from && to && from > to ? "The end date is before the start date." : null;

  const query = useMemo(() => {
    const params = new URLSearchParams({
      page: String(pagination.pageIndex + 1),
      pageSize: String(pagination.pageSize),
      sort: sorting[0]?.desc === false ? "observedAt:asc" : "observedAt:desc",
    });
    if (from) params.set("from", from);
    if (to) params.set("to", to);
    return params.toString();
  }, [pagination, sorting, from, to]);

  const { page, loading, error } = useServerPage<Page>({
    url: dateError ? null : `/api/v1/observations?${query}`,
    initial: { data: [], total: 0 },
    failure: "The Logbook could not be loaded.",
  });

  const filtered = Boolean(from || to);

  return (
    <div className="flex flex-col gap-3">
      <div className="flex flex-wrap items-end gap-3">
        <label className="flex flex-col gap-1 text-sm">
          <span className="font-medium text-ink-700">From (UT date)</span>
          <Input
            type="date"
            value={from}
            onChange={(e) => {
              setFrom(e.target.value);
              setPagination((p) => ({ ...p, pageIndex: 0 }));
            }}
            aria-label="From date"
          />
        </label>
        <label className="flex flex-col gap-1 text-sm">
          <span className="font-medium text-ink-700">To (UT date)</span>
          <Input
            type="date"
            value={to}
            onChange={(e) => {
              setTo(e.target.value);
              setPagination((p) => ({ ...p, pageIndex: 0 }));
            }}
            aria-label="To date"
          />
        </label>
        {filtered ? (
          <button
            type="button"
            className="pb-2 text-sm text-corona-700 underline"
            onClick={() => {
              setFrom("");
              setTo("");
            }}
          >
            Clear dates
          </button>
        ) : null}
      </div>
      {dateError || error ? (
        <p role="alert" className="text-sm font-medium text-caution-700">
          {dateError ?? error}
        </p>
      ) : null}
      <DataTable
        caption="Your observations"
        columns={columns}
        rows={page.data}
        rowCount={page.total}
        pagination={pagination}
        onPaginationChange={setPagination}
        sorting={sorting}
        onSortingChange={(next) => {
          setSorting(next.length ? next : [{ id: "observedAt", desc: true }]);
          setPagination((p) => ({ ...p, pageIndex: 0 }));
        }}
        loading={loading}
        empty={
          filtered ? (
            "No counts in these dates. Widen the range or clear the dates."
          ) : (
            <>
              Your Logbook is empty.{" "}
              <Link href="/logbook/new" className="font-semibold text-corona-700 underline">
                Log your first count
              </Link>{" "}
              after your next clear-sky observation.
            </>
          )
        }
      />
    </div>
  );
}
