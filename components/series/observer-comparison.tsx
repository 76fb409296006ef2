"use client";

import { useMemo, useState } from "react";

import { TimeChart, type TimeChartSeries } from "@/components/charts/time-chart";
import { Select } from "@/components/ui/field";
import type { KHistoryRow } from "@/db/queries/k";
import type { ObserverAgainstNetwork } from "@/db/queries/series-read";

import { CHART_COLOURS } from "./chart-colours";
import { useJson } from "./use-json";

type Answer = {
  observer: { id: string; displayName: string; code: string };
  points: ObserverAgainstNetwork;
  k: KHistoryRow[];
};

/**
 * One observer's scaled counts k(10g + s) beside the network's daily index,
 * with the k fitted for each period. Coordinators pick anyone from
 * `choices` or are shown one `observerId`; an observer sees themselves
 * (`fixedObserverId`, answered by the API from their session).
 */
export function ObserverComparison({
  choices,
  fixedObserverId,
  observerId: shownObserverId,
  heading = "An observer against the network",
  showKTable = true,
}: {
  choices: Array<{ id: string; displayName: string; code: string; acceptedCounts: number }>;
  fixedObserverId: string | null;
  observerId?: string;
  heading?: string;
  /** Off where the page lists the k history itself. */
  showKTable?: boolean;
}) {
  const [picked, setPicked] = useState<string>(fixedObserverId ?? shownObserverId ?? choices[0]?.id ?? "");
  const observerId = fixedObserverId ?? shownObserverId ?? picked;
  const url = observerId
    ? `/api/v1/series/observer?${new URLSearchParams(fixedObserverId ? {} : { observerId })}`
    : null;
  const { data, error, loading } = useJson<Answer>(url);

  const chart = useMemo(() => {
    if (!data) return null;
    const series: TimeChartSeries[] = [
      { label: "Network", values: data.points.network, colour: CHART_COLOURS.network, width: 1.5 },
      {
        label: `${data.observer.displayName}, k(10g + s)`,
        values: data.points.observer,
        colour: CHART_COLOURS.observer,
        style: "points",
      },
    ];
    return { days: data.points.days, series };
  }, [data]);

  if (!observerId) return null;

  return (
    <section aria-labelledby="observer-heading" className="flex flex-col gap-3">
      <div className="flex flex-wrap items-end justify-between gap-3">
        <h2 id="observer-heading" className="text-lg font-semibold text-ink-900">
          {heading}
        </h2>
        {fixedObserverId || shownObserverId ? null : (
          <label className="flex items-center gap-2 text-sm">
            <span className="font-medium text-ink-700">Observer</span>
            <Select value={picked} onChange={(e) => setPicked(e.target.value)} className="w-auto">
              {choices.map((c) => (
                <option key={c.id} value={c.id}>
                  {c.displayName} ({c.code}) · {c.acceptedCounts} counts
                </option>
              ))}
            </Select>
          </label>
        )}
      </div>
      {error ? (
        <p role="alert" className="text-sm font-medium text-caution-700">
          {error}
        </p>
      ) : loading || !data || !chart ? (
        <div
          role="status"
          className="flex h-[280px] animate-pulse items-center justify-center rounded-lg bg-ink-50 text-sm text-ink-500"
        >
          Loading the comparison…
        </div>
      ) : data.points.days.length === 0 ? (
        <p className="rounded-lg border border-dashed border-ink-200 px-4 py-6 text-sm text-ink-600">
          No accepted counts yet. The comparison appears once counts are accepted on the Review desk.
        </p>
      ) : (
        <>
          <TimeChart
            days={chart.days}
            series={chart.series}
            yLabel="Relative number"
            caption={`${data.observer.displayName}'s accepted counts scaled by the k in use (dots) against the network's daily index (line).`}
          />
          {showKTable ? <KTable rows={data.k} /> : null}
        </>
      )}
    </section>
  );
}

export function KTable({ rows }: { rows: KHistoryRow[] }) {
  if (rows.length === 0) {
    return (
      <p className="text-sm text-ink-600">
        No k fitted yet: counts stand as they are (k = 1.0) until a period has enough common days with the
        reference.
      </p>
    );
  }
  return (
    <div className="overflow-x-auto rounded-lg border border-ink-100 bg-white shadow-sm">
      <table className="min-w-full text-sm">
        <caption className="sr-only">Fitted k by instrument and period</caption>
        <thead className="bg-ink-50 text-left text-xs tracking-wide text-ink-600 uppercase">
          <tr>
            <th scope="col" className="px-3 py-2">
              Instrument
            </th>
            <th scope="col" className="px-3 py-2">
              Period
            </th>
            <th scope="col" className="px-3 py-2">
              k
            </th>
            <th scope="col" className="px-3 py-2">
              σ
            </th>
            <th scope="col" className="px-3 py-2">
              Common days
            </th>
            <th scope="col" className="px-3 py-2">
              Against
            </th>
          </tr>
        </thead>
        <tbody>
          {rows.map((row) => (
            <tr key={row.id} className="border-t border-ink-100">
              <td className="px-3 py-2">{row.instrumentName ?? "All instruments"}</td>
              <td className="px-3 py-2 whitespace-nowrap tabular-nums">
                {row.periodStart} – {row.periodEnd}
              </td>
              <td className="px-3 py-2 font-semibold tabular-nums">{row.k.toFixed(3)}</td>
              <td className="px-3 py-2 tabular-nums">
                {row.reference.startsWith("network:")
                  ? "held fixed"
                  : row.sigma === null
                    ? "—"
                    : `± ${row.sigma.toFixed(3)}`}
              </td>
              <td className="px-3 py-2 tabular-nums">{row.commonDays}</td>
              <td className="px-3 py-2">{row.referenceLabel}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
