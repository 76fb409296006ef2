/**
 * Benchmark of the counts domain at network scale. Run with
 *   npx tsx tests/bench/counts.bench.ts
 * Generates 1,000,000 invented observations (300 observers over 25 years)
 * in memory, then times the coordinator's pipeline: network k, daily index,
 * monthly and yearly means, 13-month smoothing (total and hemispheres).
 * Prints one line per step and a final JSON line for scripts to parse.
 */
import { performance } from "node:perf_hooks";

import { estimateNetworkK } from "@/lib/counts/k-coefficient";
import {
  computeDailyIndex,
  computeMonthlyMeans,
  computeYearlyMeans,
  formatDayNumber,
  smoothed13,
  toDayNumber,
  toDenseMonthlySeries,
} from "@/lib/counts/series";

import { createRandom, drawCount } from "../unit/counts/helpers";

const OBSERVATION_COUNT = 1_000_000;
const OBSERVER_COUNT = 300;
const FIRST_DAY = toDayNumber("2000-01-01");
const DAY_COUNT = toDayNumber("2025-01-01") - FIRST_DAY;
const SEED = 20_250_101;

type BenchObservation = {
  observerId: string;
  day: number;
  raw: number;
  groups: number;
  spots: number;
  northGroups: number | null;
  northSpots: number | null;
  southGroups: number | null;
  southSpots: number | null;
  k: number;
};

/** Invented activity: 11-year cycles, a 27-day modulation and a slowly drifting north/south balance. */
function describeActivity(dayIndex: number): { activity: number; northFraction: number } {
  const cycle = Math.sin((Math.PI * dayIndex) / (11 * 365.25));
  const activity = 8 + 170 * cycle * cycle * (1 + 0.2 * Math.sin((2 * Math.PI * dayIndex) / 27));
  const northFraction = 0.5 + 0.2 * Math.sin((2 * Math.PI * dayIndex) / (7 * 365.25));
  return { activity, northFraction };
}

function generateObservations(): {
  observations: BenchObservation[];
  trueK: Float64Array;
  observerIds: string[];
} {
  const random = createRandom(SEED);
  const observerIds = Array.from(
    { length: OBSERVER_COUNT },
    (_, i) => `observer-${String(i).padStart(3, "0")}`,
  );
  const trueK = Float64Array.from({ length: OBSERVER_COUNT }, (_, i) => (i === 0 ? 1 : 0.6 + 0.8 * random()));
  // Each observer is active for a span (the pilot, observer 0, for all 25
  // years), clouded out on some days, and a third give the hemisphere split.
  const spanStart = new Int32Array(OBSERVER_COUNT);
  const spanEnd = new Int32Array(OBSERVER_COUNT);
  const splitsHemispheres = new Uint8Array(OBSERVER_COUNT);
  let activeObserverDays = 0;
  for (let i = 0; i < OBSERVER_COUNT; i++) {
    const length = i === 0 ? DAY_COUNT : Math.floor(DAY_COUNT * (0.3 + 0.7 * random()));
    spanStart[i] = i === 0 ? 0 : Math.floor(random() * (DAY_COUNT - length + 1));
    spanEnd[i] = (spanStart[i] as number) + length;
    splitsHemispheres[i] = random() < 1 / 3 ? 1 : 0;
    activeObserverDays += length;
  }
  // Draw a few percent more than needed, then keep exactly OBSERVATION_COUNT
  // by selection sampling (each candidate kept with probability needed/left).
  const clearSkyProbability = Math.min(1, (1.03 * OBSERVATION_COUNT) / activeObserverDays);
  const candidateObserver = new Int32Array(Math.ceil(activeObserverDays * clearSkyProbability * 1.1) + 1000);
  const candidateDay = new Int32Array(candidateObserver.length);
  let candidates = 0;
  for (let d = 0; d < DAY_COUNT; d++) {
    for (let i = 0; i < OBSERVER_COUNT; i++) {
      if (d < (spanStart[i] as number) || d >= (spanEnd[i] as number) || random() >= clearSkyProbability)
        continue;
      candidateObserver[candidates] = i;
      candidateDay[candidates] = d;
      candidates++;
    }
  }
  if (candidates < OBSERVATION_COUNT)
    throw new Error(`Only ${candidates} candidates; raise the clear-sky probability`);

  const observations: BenchObservation[] = [];
  let needed = OBSERVATION_COUNT;
  for (let c = 0; c < candidates && needed > 0; c++) {
    if (random() * (candidates - c) >= needed) continue;
    needed--;
    const i = candidateObserver[c] as number;
    const dayIndex = candidateDay[c] as number;
    const { activity, northFraction } = describeActivity(dayIndex);
    const drawn = drawCount({ mean: activity / (trueK[i] as number), noise: "poisson", random });
    const raw = drawn < 11 ? 0 : drawn;
    const groups = raw === 0 ? 0 : Math.max(1, Math.floor(raw / 18));
    const spots = raw - 10 * groups;
    let north: [number, number, number, number] | null = null;
    if (splitsHemispheres[i] === 1) {
      const northGroups = Math.min(groups, Math.round(groups * northFraction));
      const southGroups = groups - northGroups;
      const extraSpots = spots - groups;
      const extraNorth =
        northGroups === 0 ? 0 : southGroups === 0 ? extraSpots : Math.round(extraSpots * northFraction);
      const northSpots = northGroups + extraNorth;
      north = [northGroups, northSpots, southGroups, spots - northSpots];
    }
    observations.push({
      observerId: observerIds[i] as string,
      day: FIRST_DAY + dayIndex,
      raw,
      groups,
      spots,
      northGroups: north ? north[0] : null,
      northSpots: north ? north[1] : null,
      southGroups: north ? north[2] : null,
      southSpots: north ? north[3] : null,
      k: Number.NaN, // a double from the start, so filling it in later does not reshape a million objects
    });
  }
  return { observations, trueK, observerIds };
}

function time<T>(label: string, timings: Record<string, number>, run: () => T): T {
  const start = performance.now();
  const result = run();
  const elapsedMs = performance.now() - start;
  timings[label] = Math.round(elapsedMs * 10) / 10;
  console.log(`${label.padEnd(28)} ${elapsedMs.toFixed(1).padStart(9)} ms`);
  return result;
}

function main(): void {
  const timings: Record<string, number> = {};
  const { observations, trueK, observerIds } = time(
    "generate (not in pipeline)",
    timings,
    generateObservations,
  );
  console.log(`observations ${observations.length}, observers ${OBSERVER_COUNT}, days ${DAY_COUNT}`);

  const pipelineStart = performance.now();
  const network = time("estimateNetworkK", timings, () =>
    estimateNetworkK({ observations, pilotId: observerIds[0] as string, pilotK: 1 }),
  );
  time("attach k", timings, () => {
    for (const observation of observations)
      observation.k = network.byObserver.get(observation.observerId)?.k ?? 0;
  });
  // Observers without a usable k cannot be scaled; a real pipeline drops them.
  const scaled = observations.filter((o) => o.k > 0);
  const daily = time("computeDailyIndex", timings, () => computeDailyIndex(scaled));
  const monthly = time("computeMonthlyMeans", timings, () => computeMonthlyMeans(daily));
  const yearly = time("computeYearlyMeans", timings, () => computeYearlyMeans(daily));
  const smoothed = time("dense + smoothed13 (x3)", timings, () =>
    (["total", "north", "south"] as const).map((hemisphere) =>
      smoothed13(toDenseMonthlySeries({ monthly, hemisphere }).values),
    ),
  );
  const pipelineMs = performance.now() - pipelineStart;
  console.log(`${"pipeline total".padEnd(28)} ${pipelineMs.toFixed(1).padStart(9)} ms`);

  // Extras, outside the pipeline total: the database hands days over as
  // "YYYY-MM-DD" text, and the median method does a selection per observer.
  const extras: Record<string, number> = {};
  const withTextDays = time("make text days (setup)", extras, () =>
    scaled.map((o) => ({ ...o, day: formatDayNumber(o.day) })),
  );
  time("computeDailyIndex, text days", extras, () => computeDailyIndex(withTextDays));
  time("estimateNetworkK, text days", extras, () =>
    estimateNetworkK({ observations: withTextDays, pilotId: observerIds[0] as string }),
  );
  time("estimateNetworkK, median", extras, () =>
    estimateNetworkK({ observations, pilotId: observerIds[0] as string, method: "median-of-ratios" }),
  );

  let worstKError = 0;
  let sumSquaredKError = 0;
  let fitted = 0;
  for (let i = 0; i < OBSERVER_COUNT; i++) {
    const k = network.byObserver.get(observerIds[i] as string)?.k;
    if (k == null) continue;
    const error = k / (trueK[i] as number) - 1;
    worstKError = Math.max(worstKError, Math.abs(error));
    sumSquaredKError += error * error;
    fitted++;
  }
  const summary = {
    benchmark: "counts",
    observations: observations.length,
    observers: OBSERVER_COUNT,
    days: DAY_COUNT,
    dailyValues: daily.length,
    months: monthly.length,
    years: yearly.length,
    smoothedMonths: smoothed[0]?.filter((v) => v !== null).length ?? 0,
    iterations: network.iterations,
    converged: network.converged,
    observersFitted: fitted,
    kErrorMaxPercent: Math.round(worstKError * 1e5) / 1e3,
    kErrorRmsPercent: Math.round(Math.sqrt(sumSquaredKError / Math.max(1, fitted)) * 1e5) / 1e3,
    timingsMs: timings,
    extrasMs: extras,
    pipelineMs: Math.round(pipelineMs),
    heapUsedMb: Math.round(process.memoryUsage().heapUsed / 2 ** 20),
    node: process.version,
  };
  console.log(JSON.stringify(summary));
}

main();
