"use client";

import { useMemo } from "react";

import { TimeChart, type TimeChartSeries } from "@/components/charts/time-chart";
import { CHART_COLOURS } from "@/components/series/chart-colours";
import { useJson } from "@/components/series/use-json";
import type { GroupLatitudes } from "@/db/queries/series-read";

import { ChartPlaceholder } from "./archive-charts";

/**
 * Latitude against time of every group measured on accepted counts: the
 * familiar drift of activity towards the equator over a cycle shows here.
 */
export function LatitudeDiagram() {
  const { data, error, loading } = useJson<GroupLatitudes>("/api/v1/series/latitudes");
  const chart = useMemo(() => {
    if (!data || data.days.length === 0) return null;
    const north = data.latitudes.map((lat, i) => (data.hemispheres[i] === "N" ? lat : null));
    const south = data.latitudes.map((lat, i) => (data.hemispheres[i] === "S" ? lat : null));
    const series: TimeChartSeries[] = [
      { label: "Northern groups", values: north, colour: CHART_COLOURS.north, style: "points" },
      { label: "Southern groups", values: south, colour: CHART_COLOURS.south, style: "points" },
    ];
    return { days: data.days, series };
  }, [data]);

  return (
    <section aria-labelledby="latitude-heading" className="flex flex-col gap-2">
      <h2 id="latitude-heading" className="text-lg font-semibold text-ink-900">
        Group latitudes over time
      </h2>
      {error ? (
        <p role="alert" className="text-sm font-medium text-caution-700">
          {error}
        </p>
      ) : loading ? (
        <ChartPlaceholder />
      ) : !chart ? (
        <p className="rounded-lg border border-dashed border-ink-200 px-4 py-6 text-sm text-ink-600">
          No group positions yet. Positions come from counts drawn with the Disk tracer: when observers trace
          their disk and their counts are accepted on the Review desk, each group appears here at its
          heliographic latitude.
        </p>
      ) : (
        <TimeChart
          days={chart.days}
          series={chart.series}
          yLabel="Latitude (°)"
          yRange={[-50, 50]}
          caption={`Heliographic latitude of ${data!.days.length} groups measured on accepted counts (north positive).`}
        />
      )}
    </section>
  );
}
