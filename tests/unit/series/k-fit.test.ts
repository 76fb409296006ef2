import { describe, expect, it } from "vitest";

import { toDayNumber } from "@/lib/counts/series";
import { appendCount, createAcceptedCounts, type AcceptedCounts } from "@/lib/series/accepted-counts";
import { buildKLookup, buildStoredKResolver, findKDrifts, fitPeriodK, type KUnit } from "@/lib/series/k-fit";

import { generateSyntheticNetwork } from "../counts/helpers";

function countsOf(network: ReturnType<typeof generateSyntheticNetwork>): {
  counts: AcceptedCounts;
  units: KUnit[];
} {
  const units = network.observerIds.map((id) => ({ observerId: id, instrumentId: `${id}-i` }));
  const counts = createAcceptedCounts(network.observations.length);
  const sorted = [...network.observations].sort((a, b) => a.day - b.day);
  for (const o of sorted)
    appendCount(counts, { dayNumber: o.day, unit: network.observerIds.indexOf(o.observerId), raw: o.raw });
  return { counts, units };
}

const noPrevious = (n: number) => new Float64Array(n).fill(Number.NaN);

describe("fitPeriodK", () => {
  const network = generateSyntheticNetwork({
    seed: 3,
    observerCount: 6,
    dayCount: 90,
    coverage: 0.8,
    noise: "poisson",
  });
  const { counts, units } = countsOf(network);
  const trueK = (unit: number) => network.trueK.get(network.observerIds[unit]!)!;

  it("fits against a reference series within 2% (synthetic network, about 72 common days)", () => {
    const { fits, standIn, unfitted } = fitPeriodK({
      counts,
      from: 0,
      to: counts.length,
      units,
      periodIndex: 1,
      method: "ratio-of-sums",
      minCommonDays: 20,
      reference: { kind: "series", valueOfDay: (d) => network.reference.get(d) },
      anchorK: noPrevious(units.length),
    });
    expect(standIn).toBeNull();
    expect(unfitted).toBe(false);
    expect(fits).toHaveLength(6);
    for (const fit of fits) {
      expect(fit.role).toBe("reference");
      expect(Math.abs(fit.k / trueK(fit.unit) - 1)).toBeLessThan(0.02);
    }
  });

  it("holds the pilot fixed against the network, and lets a stand-in take over when the pilot is missing", () => {
    const pilot = units[2]!.observerId;
    const held = fitPeriodK({
      counts,
      from: 0,
      to: counts.length,
      units,
      periodIndex: 1,
      method: "ratio-of-sums",
      minCommonDays: 20,
      reference: { kind: "network", pilotObserverId: pilot, pilotK: trueK(2) },
      anchorK: noPrevious(units.length),
    });
    expect(held.standIn).toBeNull();
    const pilotFit = held.fits.find((f) => f.unit === 2)!;
    expect(pilotFit).toMatchObject({ role: "pilot", k: trueK(2), sigma: 0 });
    for (const fit of held.fits) expect(Math.abs(fit.k / trueK(fit.unit) - 1)).toBeLessThan(0.02);

    // Nobody by that id counted: the unit with a previous k stands in, held at that k.
    const anchorK = noPrevious(units.length);
    anchorK[4] = trueK(4);
    const stoodIn = fitPeriodK({
      counts,
      from: 0,
      to: counts.length,
      units,
      periodIndex: 1,
      method: "ratio-of-sums",
      minCommonDays: 20,
      reference: { kind: "network", pilotObserverId: "away", pilotK: 1 },
      anchorK,
    });
    expect(stoodIn.standIn).toEqual({ unit: 4, k: trueK(4), anchored: true });
    expect(stoodIn.fits.find((f) => f.unit === 4)!.role).toBe("stand-in pilot");
    for (const fit of stoodIn.fits) expect(Math.abs(fit.k / trueK(fit.unit) - 1)).toBeLessThan(0.02);
  });

  it("fits nothing, and says so, when no one reaches the minimum", () => {
    const result = fitPeriodK({
      counts,
      from: 0,
      to: counts.length,
      units,
      periodIndex: 1,
      method: "median-of-ratios",
      minCommonDays: 200,
      reference: { kind: "network", pilotObserverId: units[0]!.observerId, pilotK: 1 },
      anchorK: noPrevious(units.length),
    });
    expect(result).toEqual({ fits: [], standIn: null, unfitted: true });
  });

  it("averages a unit's repeated counts of one day before fitting", () => {
    const small = createAcceptedCounts(4);
    const day = toDayNumber("2024-01-01");
    for (let d = 0; d < 3; d++) {
      appendCount(small, { dayNumber: day + d, unit: 0, raw: 40 });
      appendCount(small, { dayNumber: day + d, unit: 0, raw: 60 });
    }
    const { fits } = fitPeriodK({
      counts: small,
      from: 0,
      to: small.length,
      units: [{ observerId: "a", instrumentId: "a-i" }],
      periodIndex: 0,
      method: "ratio-of-sums",
      minCommonDays: 3,
      reference: { kind: "series", valueOfDay: () => 100 },
      anchorK: noPrevious(1),
    });
    // Raw 50 a day against 100: k = 2 from 3 common days (not 6).
    expect(fits).toEqual([expect.objectContaining({ k: 2, commonDays: 3 })]);
  });
});

describe("buildKLookup", () => {
  it("uses the period's k, else the latest, else 1.0", () => {
    const kOf = buildKLookup({
      fits: [
        { unit: 0, periodIndex: 10, k: 0.9, sigma: 0.01, commonDays: 30, role: "network" },
        { unit: 0, periodIndex: 12, k: 0.95, sigma: 0.01, commonDays: 30, role: "network" },
      ],
      unitCount: 2,
    });
    expect(kOf(0, 10)).toBe(0.9);
    expect(kOf(0, 11)).toBe(0.95);
    expect(kOf(0, 3)).toBe(0.95);
    expect(kOf(1, 10)).toBe(1);
  });
});

describe("buildStoredKResolver", () => {
  it("follows the instrument → observer → newest → 1.0 rule", () => {
    const resolve = buildStoredKResolver([
      {
        observerId: "a",
        instrumentId: "i1",
        periodStart: "2024-01-01",
        periodEnd: "2024-03-31",
        k: 0.8,
        computedAt: 1,
      },
      {
        observerId: "a",
        instrumentId: "i1",
        periodStart: "2024-04-01",
        periodEnd: "2024-06-30",
        k: 0.85,
        computedAt: 1,
      },
      {
        observerId: "a",
        instrumentId: null,
        periodStart: "2024-07-01",
        periodEnd: "2024-09-30",
        k: 1.2,
        computedAt: 1,
      },
      {
        observerId: "a",
        instrumentId: null,
        periodStart: "2024-10-01",
        periodEnd: "2024-12-31",
        k: 1.25,
        computedAt: 1,
      },
    ]);
    expect(resolve({ observerId: "a", instrumentId: "i1", day: "2024-02-10" })).toBe(0.8);
    expect(resolve({ observerId: "a", instrumentId: "i1", day: "2024-08-10" })).toBe(1.2);
    expect(resolve({ observerId: "a", instrumentId: "i1", day: "2025-01-10" })).toBe(0.85);
    expect(resolve({ observerId: "a", instrumentId: "i2", day: "2025-01-10" })).toBe(1.25);
    expect(resolve({ observerId: "b", instrumentId: "i3", day: "2024-02-10" })).toBe(1);
  });
});

describe("findKDrifts", () => {
  it("flags steps larger than the fraction, across gaps", () => {
    const history = [
      { periodStart: "2024-01-01", periodEnd: "2024-03-31", k: 1, sigma: 0.01 },
      { periodStart: "2024-04-01", periodEnd: "2024-06-30", k: 1.05, sigma: 0.01 },
      { periodStart: "2025-01-01", periodEnd: "2025-03-31", k: 1.3, sigma: 0.02 },
    ];
    const alerts = findKDrifts({ history, maxFraction: 0.1 });
    expect(alerts).toHaveLength(1);
    expect(alerts[0]!.previous.periodStart).toBe("2024-04-01");
    expect(alerts[0]!.relativeChange).toBeCloseTo(1.3 / 1.05 - 1, 12);
    expect(alerts[0]!.zScore).toBeCloseTo(0.25 / Math.hypot(0.01, 0.02), 9);
    expect(findKDrifts({ history, maxFraction: 0.3 })).toEqual([]);
  });
});
