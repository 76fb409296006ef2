"use client";

import "uplot/dist/uPlot.min.css";

import { useEffect, useRef, useState } from "react";
import type uPlot from "uplot";

export type TimeChartSeries = {
  label: string;
  values: ReadonlyArray<number | null>;
  /** CSS colour of the line or the points. */
  colour: string;
  /** "line" joins values (across gaps when spanGaps); "points" draws dots only (scatter). */
  style?: "line" | "points";
  width?: number;
  spanGaps?: boolean;
  dash?: number[];
  /** Decimals in the legend. */
  decimals?: number;
};

/** "YYYY-MM-DD" (UT) → seconds since 1970, the x values uPlot's time scale expects. */
export function toUnixSeconds(day: string): number {
  return Date.parse(`${day}T00:00:00Z`) / 1000;
}

/**
 * A zoomable time chart for long series (thousands of points), drawn by
 * uPlot on a canvas. Drag across the chart to zoom in; double-click to see
 * everything again. uPlot touches the DOM as soon as it loads, so it is
 * imported only in the browser, after the component mounts.
 */
export function TimeChart({
  days,
  series,
  height = 280,
  yLabel,
  caption,
  yRange,
}: {
  /** x values as "YYYY-MM-DD", ascending. */
  days: ReadonlyArray<string>;
  series: TimeChartSeries[];
  height?: number;
  yLabel: string;
  /** Read by screen readers and shown under the chart. */
  caption: string;
  yRange?: [number, number];
}) {
  const holder = useRef<HTMLDivElement>(null);
  const [failed, setFailed] = useState<string | null>(null);

  useEffect(() => {
    const element = holder.current;
    if (!element) return;
    let chart: uPlot | null = null;
    let cancelled = false;
    let observer: ResizeObserver | null = null;

    import("uplot")
      .then(({ default: UPlot }) => {
        if (cancelled) return;
        const xs = days.map(toUnixSeconds);
        const data = [xs, ...series.map((s) => [...s.values])] as unknown as uPlot.AlignedData;
        const options: uPlot.Options = {
          width: Math.max(320, element.clientWidth),
          height,
          scales: {
            x: { time: true },
            y: yRange ? { range: yRange } : { range: (_u, min, max) => [Math.min(0, min), max * 1.05 || 1] },
          },
          cursor: { drag: { x: true, y: false }, points: { size: 6 } },
          legend: { live: true },
          axes: [
            { stroke: "#42435f", grid: { stroke: "#ececf2" } },
            { label: yLabel, stroke: "#42435f", grid: { stroke: "#ececf2" }, size: 56 },
          ],
          series: [
            {
              label: "UT day",
              value: (_u, v) => (v == null ? "—" : new Date(v * 1000).toISOString().slice(0, 10)),
            },
            ...series.map((s): uPlot.Series => ({
              label: s.label,
              stroke: s.colour,
              width: s.style === "points" ? 0 : (s.width ?? 1.5),
              spanGaps: s.spanGaps ?? false,
              dash: s.dash,
              value: (_u, v) => (v == null ? "—" : v.toFixed(s.decimals ?? 1)),
              ...(s.style === "points"
                ? {
                    paths: () => null,
                    points: { show: true, size: 4, stroke: s.colour, fill: s.colour, width: 0 },
                  }
                : { points: { show: false } }),
            })),
          ],
        };
        chart = new UPlot(options, data, element);
        observer = new ResizeObserver(() =>
          chart?.setSize({ width: Math.max(320, element.clientWidth), height }),
        );
        observer.observe(element);
      })
      .catch((error: unknown) =>
        setFailed(error instanceof Error ? error.message : "The chart could not be drawn."),
      );

    return () => {
      cancelled = true;
      observer?.disconnect();
      chart?.destroy();
    };
  }, [days, series, height, yLabel, yRange]);

  return (
    <figure className="flex flex-col gap-2">
      {failed ? (
        <p role="alert" className="text-sm text-caution-700">
          {failed}
        </p>
      ) : null}
      <div
        ref={holder}
        className="w-full overflow-hidden"
        role="img"
        aria-label={caption}
        data-testid="time-chart"
      />
      <figcaption className="text-xs text-ink-500">
        {caption}{" "}
        <span className="no-print">Drag across the chart to zoom in; double-click to see everything.</span>
      </figcaption>
    </figure>
  );
}
