/**
 * The full recompute's k fit on two threads (lib/series/k-fit-helper.ts),
 * with its result written by the helper, against the same fit on one,
 * written on the server's thread: the same coefficients, series and notes to
 * the bit, including periods where the pilot is away and another observer
 * stands in, held at its k of the period before (or, at the start, of the
 * period after).
 */
import { beforeAll, describe, expect, it } from "vitest";

import { getDb } from "@/db/client";
import { loadAcceptedCounts, runFullRecompute } from "@/db/queries/recompute";
import { formatDayNumber, toDayNumber } from "@/lib/counts/series";
import { sliceByKey } from "@/lib/series/accepted-counts";
import { fitAllPeriods, whenKFitHelperReady } from "@/lib/series/k-fit-helper";
import { findPeriodIndex } from "@/lib/series/periods";
import { DEFAULT_K_SETTINGS } from "@/lib/validation/k-settings";

import { generateSyntheticNetwork, insertNetwork, makeUnits, type Unit } from "./series-support";

let pilot: Unit;

beforeAll(async () => {
  // Invented: 9 observers over two years; the pilot (obs-000) has no counts
  // in the first quarter of 2023 nor the third.
  const network = generateSyntheticNetwork({
    seed: 23,
    observerCount: 9,
    dayCount: 731,
    firstDayNumber: toDayNumber("2023-01-01"),
    coverage: 0.6,
    noise: "poisson",
  });
  network.observations = network.observations.filter((o) => {
    if (o.observerId !== "obs-000") return true;
    const day = formatDayNumber(o.day);
    return !(day < "2023-04-01" || (day >= "2023-07-01" && day < "2023-10-01"));
  });
  const units = await makeUnits({ ids: network.observerIds });
  pilot = units.get("obs-000")!;
  await insertNetwork({ network, units });
}, 60_000);

async function snapshot() {
  const client = getDb().$client;
  const k = await client.execute(
    `SELECT observer_id, instrument_id, period_start, period_end, k, sigma, common_days, reference
     FROM k_coefficients ORDER BY instrument_id, period_start`,
  );
  const daily = await client.execute(
    "SELECT day, hemisphere, observers, sum, sum_squares, mean, sd FROM series_daily ORDER BY hemisphere, day",
  );
  return { k: k.rows.map((r) => ({ ...r })), daily: daily.rows.map((r) => ({ ...r })) };
}

describe("the k fit on two threads", () => {
  it("gives exactly what one thread gives, stand-ins included", async () => {
    expect(await whenKFitHelperReady()).toBe(true);
    const settings = {
      ...DEFAULT_K_SETTINGS,
      periodKind: "quarter" as const,
      pilotObserverId: pilot.observerId,
    };

    // Small periods: this thread may take them all before the helper takes
    // one (the test below makes sure the helper works).
    const two = await runFullRecompute({ settings, threads: 2 });
    const fromTwo = await snapshot();
    const one = await runFullRecompute({ settings, threads: 1 });
    expect(one.kFitThreads).toBe(1);
    // The helper wrote the first result as it was made; this thread the second.
    expect(two.writtenOn).toBe("helper");
    expect(one.writtenOn).toBe("server");
    const fromOne = await snapshot();

    expect(fromTwo).toEqual(fromOne);
    expect(two.notes).toEqual(one.notes);
    expect(two.periods).toBe(8);
    // Both stand-in cases happened: with a neighbouring k, and at the start.
    expect(fromOne.k.filter((r) => r.reference === "network:stand-in")).toHaveLength(2);
    expect(two.notes.filter((note) => note.includes("stood in"))).toHaveLength(2);
    // Each stand-in is held at its own k of the second quarter: the first
    // quarter's, which has no period before it, at the nearest later one.
    const standIns = fromOne.k.filter((r) => r.reference === "network:stand-in");
    expect(standIns.map((r) => r.period_start).sort()).toEqual(["2023-01-01", "2023-07-01"]);
    for (const row of standIns) {
      const secondQuarter = fromOne.k.find(
        (r) => r.instrument_id === row.instrument_id && r.period_start === "2023-04-01",
      );
      expect(row.k).toBe(secondQuarter?.k);
    }
    expect(two.notes.every((note) => !note.includes("no neighbouring k"))).toBe(true);
    expect(fromOne.k.length).toBeGreaterThan(60);
  });

  it("shares the periods between the threads and gives the same fits", async () => {
    expect(await whenKFitHelperReady()).toBe(true);
    const { counts, units } = await loadAcceptedCounts();
    const periods = sliceByKey({ counts, keyOf: (day) => findPeriodIndex({ day, kind: "quarter" }) });
    const job = {
      counts,
      units,
      periods,
      method: "ratio-of-sums" as const,
      minCommonDays: 20,
      reference: { kind: "network" as const, pilotObserverId: pilot.observerId, pilotK: 1 },
    };
    const taken: number[] = [];
    // This thread pauses after each period, so the helper surely takes some.
    const shared = await fitAllPeriods({
      ...job,
      betweenPeriods: async (position) => {
        taken.push(position);
        await new Promise((resolve) => setTimeout(resolve, 40));
      },
    });
    expect(shared.threads).toBe(2);
    expect(taken.length).toBeGreaterThan(0);
    expect(taken.length).toBeLessThan(periods.length);
    const alone = await fitAllPeriods({ ...job, threads: 1 });
    expect(alone.threads).toBe(1);
    expect(shared.results).toEqual(alone.results);
    expect(shared.results.filter((result) => result.standIn)).toHaveLength(2);

    // Against a reference series too (invented values, one per day), which
    // the helper receives as values rather than as a function.
    const values = new Map<number, number>();
    for (let i = 0; i < counts.length; i++)
      values.set(counts.dayNumber[i]!, 80 + (counts.dayNumber[i]! % 50));
    const againstSeries = { ...job, reference: { kind: "series" as const, values } };
    const seriesShared = await fitAllPeriods({
      ...againstSeries,
      betweenPeriods: () => new Promise<void>((resolve) => setTimeout(resolve, 40)),
    });
    expect(seriesShared.threads).toBe(2);
    const seriesAlone = await fitAllPeriods({ ...againstSeries, threads: 1 });
    expect(seriesShared.results).toEqual(seriesAlone.results);
    expect(seriesAlone.results.flatMap((result) => result.fits).every((f) => f.role === "reference")).toBe(
      true,
    );
    expect(seriesAlone.results.flatMap((result) => result.fits).length).toBeGreaterThan(60);
  });
});
