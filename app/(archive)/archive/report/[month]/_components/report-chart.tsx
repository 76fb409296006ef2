"use client";

import { useMemo } from "react";

import { TimeChart, type TimeChartSeries } from "@/components/charts/time-chart";
import { CHART_COLOURS } from "@/components/series/chart-colours";

export function ReportChart({
  days,
  all,
  north,
  south,
}: {
  days: string[];
  all: Array<number | null>;
  north: Array<number | null>;
  south: Array<number | null>;
}) {
  const series = useMemo<TimeChartSeries[]>(
    () => [
      { label: "Whole disk", values: all, colour: CHART_COLOURS.smoothed, width: 2 },
      { label: "North", values: north, colour: CHART_COLOURS.north, width: 1.5, spanGaps: true },
      { label: "South", values: south, colour: CHART_COLOURS.south, width: 1.5, spanGaps: true },
    ],
    [all, north, south],
  );
  return (
    <TimeChart
      days={days}
      series={series}
      height={240}
      yLabel="Relative number"
      caption="Daily index of the month, whole disk and by hemisphere."
    />
  );
}
