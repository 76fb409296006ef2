"use client";

import { useMemo } from "react";

import { TimeChart, type TimeChartSeries } from "@/components/charts/time-chart";
import type { ChartSeries } from "@/db/queries/series-read";

import { CHART_COLOURS } from "@/components/series/chart-colours";
import { useJson } from "@/components/series/use-json";

/**
 * Puts daily values and mid-month values on one time axis (the 15th of each
 * month), as uPlot wants one x array for every line.
 */
function mergeDailyAndMonthly(chart: ChartSeries) {
  const days = [...new Set([...chart.daily.days, ...chart.monthly.months])].sort();
  const position = new Map(days.map((d, i) => [d, i]));
  const blank = () => new Array<number | null>(days.length).fill(null);
  const daily = blank();
  const monthly = blank();
  const smoothed = blank();
  chart.daily.days.forEach((d, i) => (daily[position.get(d)!] = chart.daily.all[i] ?? null));
  chart.monthly.months.forEach((m, i) => {
    monthly[position.get(m)!] = chart.monthly.all[i] ?? null;
    smoothed[position.get(m)!] = chart.monthly.allSmoothed[i] ?? null;
  });
  return { days, daily, monthly, smoothed };
}

export function ArchiveCharts() {
  const { data, error, loading } = useJson<ChartSeries>("/api/v1/series/chart");

  const overall = useMemo(() => {
    if (!data) return null;
    const merged = mergeDailyAndMonthly(data);
    const series: TimeChartSeries[] = [
      { label: "Daily", values: merged.daily, colour: CHART_COLOURS.daily, width: 1 },
      {
        label: "Monthly mean",
        values: merged.monthly,
        colour: CHART_COLOURS.monthly,
        width: 2,
        spanGaps: true,
      },
      {
        label: "13-month smoothed",
        values: merged.smoothed,
        colour: CHART_COLOURS.smoothed,
        width: 3,
        spanGaps: true,
      },
    ];
    return { days: merged.days, series };
  }, [data]);

  const hemispheres = useMemo(() => {
    if (!data) return null;
    const series: TimeChartSeries[] = [
      { label: "North, monthly", values: data.monthly.north, colour: CHART_COLOURS.north, width: 1.5 },
      { label: "South, monthly", values: data.monthly.south, colour: CHART_COLOURS.south, width: 1.5 },
      {
        label: "North, smoothed",
        values: data.monthly.northSmoothed,
        colour: CHART_COLOURS.north,
        width: 3,
        dash: [6, 4],
      },
      {
        label: "South, smoothed",
        values: data.monthly.southSmoothed,
        colour: CHART_COLOURS.south,
        width: 3,
        dash: [6, 4],
      },
    ];
    return { days: data.monthly.months, series };
  }, [data]);

  if (error) {
    return (
      <p role="alert" className="text-sm font-medium text-caution-700">
        {error}
      </p>
    );
  }
  return (
    <>
      <section aria-labelledby="overall-heading" className="flex flex-col gap-2">
        <h2 id="overall-heading" className="text-lg font-semibold text-ink-900">
          Relative number: daily, monthly and smoothed
        </h2>
        {loading || !overall ? (
          <ChartPlaceholder />
        ) : (
          <TimeChart
            days={overall.days}
            series={overall.series}
            yLabel="Relative number"
            caption={`Network daily index on ${data!.daily.days.length} days, with monthly means and the 13-month smoothed mean.`}
          />
        )}
      </section>
      <section aria-labelledby="hemispheres-heading" className="flex flex-col gap-2">
        <h2 id="hemispheres-heading" className="text-lg font-semibold text-ink-900">
          Northern and southern hemispheres
        </h2>
        {loading || !hemispheres ? (
          <ChartPlaceholder />
        ) : hemispheres.series.every((s) => s.values.every((v) => v === null)) ? (
          <p className="rounded-lg border border-dashed border-ink-200 px-4 py-6 text-sm text-ink-600">
            No hemispheric numbers yet. They come from counts that give the north and south split; observers
            can add it when they log a count.
          </p>
        ) : (
          <TimeChart
            days={hemispheres.days}
            series={hemispheres.series}
            yLabel="Relative number"
            caption="Monthly means of the hemispheric numbers (from counts that give the north/south split), with their 13-month smoothed means."
          />
        )}
      </section>
    </>
  );
}

export function ChartPlaceholder({ label = "Loading the chart…" }: { label?: string }) {
  return (
    <div
      role="status"
      className="flex h-[280px] animate-pulse items-center justify-center rounded-lg bg-ink-50 text-sm text-ink-500"
    >
      {label}
    </div>
  );
}
