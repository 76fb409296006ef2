"use client";

import { createColumnHelper, type PaginationState, type SortingState } from "@tanstack/react-table";
import { useMemo, useState } from "react";

import { DataTable, type ServerColumn, type ServerTableFeatures } from "@/components/ui/data-table";
import { useServerPage } from "@/components/ui/use-server-page";
import { Input, Select } from "@/components/ui/field";
import type { DailySeriesRow, MonthlySeriesRow, YearlySeriesRow } from "@/db/queries/series-read";
import { formatRelativeNumber } from "@/lib/format/time";
import type { SeriesKind } from "@/lib/validation/series-query";

type Row = DailySeriesRow | MonthlySeriesRow | YearlySeriesRow;
type Page = { kind: SeriesKind; data: Row[]; total: number };

const daily = createColumnHelper<ServerTableFeatures, DailySeriesRow>();
const monthly = createColumnHelper<ServerTableFeatures, MonthlySeriesRow>();
const yearly = createColumnHelper<ServerTableFeatures, YearlySeriesRow>();
const number = (value: number | null | undefined) => (value == null ? "—" : formatRelativeNumber(value));

const COLUMNS = {
  daily: [
    daily.accessor("day", { header: "UT day", enableSorting: true }),
    daily.accessor("mean", {
      header: "Relative number",
      enableSorting: true,
      cell: (i) => <strong>{number(i.getValue())}</strong>,
    }),
    daily.accessor("observers", { header: "Observers", enableSorting: true }),
    daily.accessor("sd", { header: "SD", enableSorting: true, cell: (i) => number(i.getValue()) }),
  ],
  monthly: [
    monthly.accessor("month", { header: "Month", enableSorting: true }),
    monthly.accessor("mean", {
      header: "Monthly mean",
      enableSorting: true,
      cell: (i) => <strong>{number(i.getValue())}</strong>,
    }),
    monthly.accessor("smoothed", {
      header: "13-month smoothed",
      enableSorting: true,
      cell: (i) => number(i.getValue()),
    }),
    monthly.accessor("days", { header: "Days with data", enableSorting: true }),
  ],
  yearly: [
    yearly.accessor("year", { header: "Year", enableSorting: true }),
    yearly.accessor("mean", {
      header: "Yearly mean",
      enableSorting: true,
      cell: (i) => <strong>{number(i.getValue())}</strong>,
    }),
    yearly.accessor("days", { header: "Days with data", enableSorting: true }),
  ],
} as unknown as Record<SeriesKind, ServerColumn<Row>[]>;

const TIME_COLUMN: Record<SeriesKind, string> = { daily: "day", monthly: "month", yearly: "year" };
const KIND_LABELS: Record<SeriesKind, string> = { daily: "Daily", monthly: "Monthly", yearly: "Yearly" };
const HEMISPHERE_LABELS = { all: "Whole disk", N: "Northern hemisphere", S: "Southern hemisphere" } as const;
type HemisphereChoice = keyof typeof HEMISPHERE_LABELS;

const BOUND_INPUT: Record<SeriesKind, { type: string; placeholder: string; pattern: RegExp }> = {
  daily: { type: "date", placeholder: "2026-03-14", pattern: /^\d{4}-\d{2}-\d{2}$/ },
  monthly: { type: "month", placeholder: "2026-03", pattern: /^\d{4}-(0[1-9]|1[0-2])$/ },
  yearly: { type: "number", placeholder: "2026", pattern: /^\d{4}$/ },
};

/**
 * The stored series as tables, paged and sorted by the server
 * (GET /api/v1/series/<kind>), with a CSV export of the filtered range.
 */
export function SeriesTables() {
  const [kind, setKind] = useState<SeriesKind>("daily");
  const [hemisphere, setHemisphere] = useState<HemisphereChoice>("all");
  const [from, setFrom] = useState("");
  const [to, setTo] = useState("");
  const [pagination, setPagination] = useState<PaginationState>({ pageIndex: 0, pageSize: 50 });
  const [sorting, setSorting] = useState<SortingState>([{ id: "day", desc: true }]);

  const bound = BOUND_INPUT[kind];
  const boundError =
    (from && !bound.pattern.test(from)) || (to && !bound.pattern.test(to))
      ? `Write the range as ${bound.placeholder}.`
      : from && to && from > to
        ? "The end of the range is before its start."
        : null;

  const filters = useMemo(() => {
    const params = new URLSearchParams({ hemisphere });
    if (from) params.set("from", from);
    if (to) params.set("to", to);
    return params;
  }, [hemisphere, from, to]);

  const query = useMemo(() => {
    const params = new URLSearchParams(filters);
    const sort = sorting[0] ?? { id: TIME_COLUMN[kind], desc: true };
    params.set("page", String(pagination.pageIndex + 1));
    params.set("pageSize", String(pagination.pageSize));
    params.set("sort", `${sort.id}:${sort.desc ? "desc" : "asc"}`);
    return `${kind}?${params.toString()}`;
  }, [filters, sorting, pagination, kind]);

  const shown = useServerPage<Omit<Page, "kind">>({
    url: boundError ? null : `/api/v1/series/${query}`,
    initial: { data: [], total: 0 },
    failure: "The table could not be loaded.",
  });
  const { loading, error } = shown;
  // The kind of the rows shown, from the URL they came from: they stay on
  // screen, with their own columns, until the next kind's page arrives.
  const page: Page = {
    ...shown.page,
    kind: shown.shownUrl
      ? (shown.shownUrl.slice("/api/v1/series/".length).split("?")[0] as SeriesKind)
      : "daily",
  };
  const resetPage = () => setPagination((p) => ({ ...p, pageIndex: 0 }));

  return (
    <div className="flex flex-col gap-3">
      <div className="flex flex-wrap items-end gap-3">
        <div
          role="tablist"
          aria-label="Series"
          className="flex rounded-md border border-ink-200 bg-white p-0.5"
        >
          {(Object.keys(KIND_LABELS) as SeriesKind[]).map((k) => (
            <button
              key={k}
              type="button"
              role="tab"
              aria-selected={kind === k}
              className={`rounded px-3 py-1.5 text-sm font-medium ${kind === k ? "bg-ink-900 text-white" : "text-ink-700 hover:bg-ink-50"}`}
              onClick={() => {
                setKind(k);
                setFrom("");
                setTo("");
                setSorting([{ id: TIME_COLUMN[k], desc: true }]);
                resetPage();
              }}
            >
              {KIND_LABELS[k]}
            </button>
          ))}
        </div>
        <label className="flex flex-col gap-1 text-sm">
          <span className="font-medium text-ink-700">Hemisphere</span>
          <Select
            value={hemisphere}
            onChange={(e) => {
              setHemisphere(e.target.value as HemisphereChoice);
              resetPage();
            }}
            className="w-auto"
          >
            {(Object.keys(HEMISPHERE_LABELS) as HemisphereChoice[]).map((h) => (
              <option key={h} value={h}>
                {HEMISPHERE_LABELS[h]}
              </option>
            ))}
          </Select>
        </label>
        {(["from", "to"] as const).map((which) => (
          <label key={which} className="flex flex-col gap-1 text-sm">
            <span className="font-medium text-ink-700">{which === "from" ? "From" : "To"}</span>
            <Input
              type={bound.type}
              value={which === "from" ? from : to}
              placeholder={bound.placeholder}
              aria-label={`${which === "from" ? "From" : "To"} (${KIND_LABELS[kind].toLowerCase()})`}
              className="w-44"
              onChange={(e) => {
                (which === "from" ? setFrom : setTo)(e.target.value);
                resetPage();
              }}
            />
          </label>
        ))}
        <a
          href={`/api/v1/series/${kind}.csv?${filters.toString()}`}
          className="mb-0.5 inline-flex items-center rounded-md border border-ink-200 bg-white px-3 py-2 text-sm font-semibold text-ink-800 hover:bg-ink-50"
          download
        >
          Download CSV
        </a>
      </div>
      {boundError || error ? (
        <p role="alert" className="text-sm font-medium text-caution-700">
          {boundError ?? error}
        </p>
      ) : null}
      <DataTable
        caption={`${KIND_LABELS[kind]} relative numbers, ${HEMISPHERE_LABELS[hemisphere].toLowerCase()}`}
        columns={COLUMNS[kind]}
        // Rows of the kind just left would not fit the new columns.
        rows={page.kind === kind ? page.data : []}
        rowCount={page.kind === kind ? page.total : 0}
        pagination={pagination}
        onPaginationChange={setPagination}
        sorting={sorting}
        onSortingChange={(next) => {
          setSorting(next.length ? next : [{ id: TIME_COLUMN[kind], desc: true }]);
          resetPage();
        }}
        loading={loading}
        empty={
          from || to ? "Nothing in this range. Widen it or clear the dates." : "No values in this series yet."
        }
      />
    </div>
  );
}
