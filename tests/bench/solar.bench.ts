/**
 * Speed of the solar geometry: `npx tsx tests/bench/solar.bench.ts`.
 *
 * Prints one line per measurement and a final JSON line for scripts. Each
 * measurement runs for a fixed time budget (not a fixed count) so the whole
 * run stays near 10 s even on a slow 2-core machine.
 */
import { performance } from "node:perf_hooks";

import { solarOrientation } from "../../lib/solar/ephemeris";
import { computeHeliographicGrid } from "../../lib/solar/grid";
import { diskToHeliographic, type DiskPoint } from "../../lib/solar/heliographic";

const WARMUP_MS = 500;
const BUDGET_MS = 2_000;

/** Runs `work` in batches until the budget is spent; returns calls per second. */
function measureRate(work: (iteration: number) => void, batchSize: number, budgetMs: number): number {
  const warmupEnd = performance.now() + WARMUP_MS;
  let iteration = 0;
  while (performance.now() < warmupEnd) {
    for (let i = 0; i < batchSize; i += 1) work(iteration++);
  }
  let calls = 0;
  const start = performance.now();
  let elapsed = 0;
  while (elapsed < budgetMs) {
    for (let i = 0; i < batchSize; i += 1) work(iteration++);
    calls += batchSize;
    elapsed = performance.now() - start;
  }
  return (calls / elapsed) * 1000;
}

function makeDiskPoints(count: number): DiskPoint[] {
  // A fixed spiral over the disk (r up to 0.98), so every run converts the same points.
  return Array.from({ length: count }, (_, i) => {
    const r = 0.98 * Math.sqrt((i + 0.5) / count);
    const angle = i * 2.399963229728653; // golden angle
    return { x: r * Math.cos(angle), y: r * Math.sin(angle) };
  });
}

function formatRate(rate: number): string {
  return Math.round(rate).toLocaleString("en-US");
}

function main(): void {
  const at = new Date("2024-05-10T12:00:00Z");
  const orientation = solarOrientation(at);
  const points = makeDiskPoints(4096);
  let sink = 0; // keeps the optimiser from dropping the work

  const withOrientation = measureRate(
    (i) => {
      const point = points[i & 4095];
      if (point) sink += diskToHeliographic(point, orientation)?.lat ?? 0;
    },
    4096,
    BUDGET_MS,
  );
  console.log(`diskToHeliographic, precomputed orientation: ${formatRate(withOrientation)} calls/s`);

  const withDate = measureRate(
    (i) => {
      const point = points[i & 4095];
      // A new Date each call, as a careless caller would pass, so no caching can help.
      if (point) sink += diskToHeliographic(point, new Date(at.getTime() + i))?.lat ?? 0;
    },
    64,
    BUDGET_MS,
  );
  console.log(`diskToHeliographic, Date (orientation each call): ${formatRate(withDate)} calls/s`);

  const orientationRate = measureRate(
    (i) => {
      sink += solarOrientation(new Date(at.getTime() + i * 60_000)).p;
    },
    64,
    BUDGET_MS,
  );
  console.log(`solarOrientation: ${formatRate(orientationRate)} calls/s`);

  const gridRate = measureRate(
    () => {
      sink += computeHeliographicGrid({ at: orientation }).parallels.length;
    },
    1,
    BUDGET_MS,
  );
  const gridMs = 1000 / gridRate;
  const grid = computeHeliographicGrid({ at: orientation });
  const gridPoints = [
    ...grid.equator.segments,
    ...grid.centralMeridian.segments,
    ...grid.parallels.flatMap((line) => line.segments),
    ...grid.meridians.flatMap((line) => line.segments),
  ].reduce((sum, segment) => sum + segment.length, 0);
  console.log(
    `computeHeliographicGrid (10° spacing, 1° sampling): ${gridMs.toFixed(2)} ms per instant, ${gridPoints} points`,
  );

  const gridFromDateRate = measureRate(
    (i) => {
      sink += computeHeliographicGrid({ at: new Date(at.getTime() + i * 60_000) }).parallels.length;
    },
    1,
    BUDGET_MS,
  );
  console.log(`computeHeliographicGrid from a Date: ${(1000 / gridFromDateRate).toFixed(2)} ms per instant`);

  if (!Number.isFinite(sink)) throw new Error("benchmark produced a non-finite checksum");
  console.log(
    JSON.stringify({
      bench: "solar",
      node: process.version,
      diskToHeliographicPerSecondWithOrientation: Math.round(withOrientation),
      diskToHeliographicPerSecondWithDate: Math.round(withDate),
      solarOrientationPerSecond: Math.round(orientationRate),
      gridMsPerInstant: Number(gridMs.toFixed(3)),
      gridFromDateMsPerInstant: Number((1000 / gridFromDateRate).toFixed(3)),
      gridPoints,
    }),
  );
}

main();
