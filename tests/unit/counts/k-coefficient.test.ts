import { describe, expect, it } from "vitest";

import {
  DEFAULT_MIN_COMMON_DAYS,
  detectKDrift,
  estimateK,
  hasEnoughCommonDays,
  K_METHODS,
  type KPair,
} from "@/lib/counts/k-coefficient";

import { createRandom, drawCount, generateSyntheticNetwork } from "./helpers";

// Five days; the last two are left out by every method (reference 0, raw 0).
const HAND_PAIRS: KPair[] = [
  { reference: 20, raw: 25 },
  { reference: 30, raw: 30 },
  { reference: 50, raw: 40 },
  { reference: 0, raw: 22 },
  { reference: 40, raw: 0 },
];

describe("estimateK on a hand-worked example", () => {
  it("ratio of sums", () => {
    // Worked by hand, days used: (20, 25), (30, 30), (50, 40); n = 3.
    // k = (20 + 30 + 50) / (25 + 30 + 40) = 100 / 95 = 20/19 = 1.0526316
    // residuals e = ref − k·raw: 20 − 500/19 = −120/19, 30 − 600/19 = −30/19,
    //   50 − 800/19 = 150/19;  Σe² = (14400 + 900 + 22500)/361 = 37800/361
    // sigma = √(n/(n−1) · Σe²) / Σraw = √(1.5 · 37800/361) / 95
    //       = (√56700 / 19) / 95 = 238.1176 / 1805 = 0.1319211
    const estimate = estimateK(HAND_PAIRS, "ratio-of-sums", { minCommonDays: 3 });
    expect(estimate.n).toBe(3);
    expect(estimate.k).toBeCloseTo(20 / 19, 12);
    expect(estimate.sigma).toBeCloseTo(0.1319211, 6);
    expect(estimate.meetsMinimum).toBe(true);
  });

  it("mean of ratios", () => {
    // Worked by hand: ratios 20/25 = 0.8, 30/30 = 1.0, 50/40 = 1.25.
    // k = (0.8 + 1.0 + 1.25) / 3 = 3.05 / 3 = 1.0166667
    // deviations −0.2166667, −0.0166667, 0.2333333; squares sum to 0.1016667
    // SD = √(0.1016667 / 2) = 0.2254625; sigma = SD / √3 = 0.1301708
    const estimate = estimateK(HAND_PAIRS, "mean-of-ratios", { minCommonDays: 3 });
    expect(estimate.n).toBe(3);
    expect(estimate.k).toBeCloseTo(1.0166667, 6);
    expect(estimate.sigma).toBeCloseTo(0.1301708, 6);
  });

  it("median of ratios", () => {
    // Worked by hand: ratios 0.8, 1.0, 1.25 → median 1.0.
    // |ratio − 1.0| = 0.2, 0, 0.25 → median 0.2; scaled MAD = 1.4826 · 0.2 = 0.29652
    // sigma = 1.2533 · 0.29652 / √3 = 0.2145598
    const estimate = estimateK(HAND_PAIRS, "median-of-ratios", { minCommonDays: 3 });
    expect(estimate.n).toBe(3);
    expect(estimate.k).toBe(1);
    expect(estimate.sigma).toBeCloseTo(0.2145598, 6);
  });

  it("median of an even number of ratios is the mean of the middle two", () => {
    // Worked by hand: ratios 0.5, 0.8, 1.0, 2.0 → (0.8 + 1.0) / 2 = 0.9.
    const pairs = [
      { reference: 10, raw: 20 },
      { reference: 40, raw: 50 },
      { reference: 30, raw: 30 },
      { reference: 60, raw: 30 },
    ];
    expect(estimateK(pairs, "median-of-ratios").k).toBeCloseTo(0.9, 12);
  });

  it("the methods differ as expected when one busy day disagrees", () => {
    // Ratio of sums follows the busy day (ref 300 vs raw 200, ratio 1.5);
    // the median ignores it. Worked by hand: Σref = 20+20+20+300 = 360,
    // Σraw = 25·3 + 200 = 275 → 1.3090909; ratios 0.8, 0.8, 0.8, 1.5 →
    // mean 0.975, median 0.8.
    const pairs = [
      { reference: 20, raw: 25 },
      { reference: 20, raw: 25 },
      { reference: 20, raw: 25 },
      { reference: 300, raw: 200 },
    ];
    expect(estimateK(pairs, "ratio-of-sums").k).toBeCloseTo(1.3090909, 6);
    expect(estimateK(pairs, "mean-of-ratios").k).toBeCloseTo(0.975, 12);
    expect(estimateK(pairs, "median-of-ratios").k).toBeCloseTo(0.8, 12);
  });

  it("an exactly proportional observer gives the same k with sigma 0 by every method", () => {
    const pairs = [11, 37, 54, 120, 96].map((raw) => ({ reference: 0.8 * raw, raw }));
    for (const method of K_METHODS) {
      const estimate = estimateK(pairs, method);
      expect(estimate.k).toBeCloseTo(0.8, 12);
      expect(estimate.sigma).toBeCloseTo(0, 12);
    }
  });
});

describe("estimateK edge cases", () => {
  it("returns k = null, n = 0 when no day is usable", () => {
    for (const method of K_METHODS) {
      for (const pairs of [
        [],
        [{ reference: 0, raw: 0 }],
        [
          { reference: 0, raw: 30 },
          { reference: 25, raw: 0 },
        ],
      ]) {
        const estimate = estimateK(pairs, method);
        expect(estimate).toEqual({ k: null, n: 0, sigma: null, method, meetsMinimum: false });
      }
    }
  });

  it("gives k but no sigma from a single day", () => {
    for (const method of K_METHODS) {
      const estimate = estimateK([{ reference: 33, raw: 30 }], method);
      expect(estimate.k).toBeCloseTo(1.1, 12);
      expect(estimate.n).toBe(1);
      expect(estimate.sigma).toBeNull();
    }
  });

  it("throws on negative or non-finite values instead of skipping them", () => {
    expect(() => estimateK([{ reference: -1, raw: 10 }])).toThrow(RangeError);
    expect(() => estimateK([{ reference: 10, raw: Number.NaN }])).toThrow(RangeError);
    expect(() => estimateK([{ reference: Number.POSITIVE_INFINITY, raw: 10 }])).toThrow(RangeError);
  });

  it("reports whether the minimum number of common days was reached, still returning k below it", () => {
    const pairs = Array.from({ length: 19 }, (_, i) => ({ reference: 50 + i, raw: 50 + i }));
    const short = estimateK(pairs);
    expect(DEFAULT_MIN_COMMON_DAYS).toBe(20);
    expect(short.k).toBeCloseTo(1, 12);
    expect(short.meetsMinimum).toBe(false);
    expect(estimateK([...pairs, { reference: 10, raw: 0 }]).meetsMinimum).toBe(false);
    expect(estimateK([...pairs, { reference: 70, raw: 70 }]).meetsMinimum).toBe(true);
    expect(estimateK(pairs, "ratio-of-sums", { minCommonDays: 10 }).meetsMinimum).toBe(true);
    expect(hasEnoughCommonDays({ n: 19 })).toBe(false);
    expect(hasEnoughCommonDays({ n: 20 })).toBe(true);
    expect(hasEnoughCommonDays({ n: 0, minCommonDays: 0 })).toBe(false);
  });

  it("defaults to ratio of sums", () => {
    expect(estimateK(HAND_PAIRS).method).toBe("ratio-of-sums");
    expect(estimateK(HAND_PAIRS).k).toBeCloseTo(20 / 19, 12);
  });
});

describe("estimateK against an imported reference (synthetic network, 60 common days)", () => {
  // Reference-scale activity 250–400 (an active stretch near maximum), raw
  // counts with uniform ±√N noise (variance N/3), reference with ±1% noise.
  // Expected standard error of k by ratio of sums: 1/√(3·Σraw) ≈ 0.3–0.5%
  // over 60 days, so 2% is more than 4 sigma. Over seeds 1–500 of this
  // generator no k missed 2%.
  it.each([1, 2, 3])("recovers every k in 0.6–1.4 within 2%% (seed %i)", (seed) => {
    const network = generateSyntheticNetwork({
      seed,
      observerCount: 12,
      dayCount: 60,
      activityMinimum: 250,
      activityMaximum: 400,
    });
    for (const observerId of network.observerIds) {
      const pairs = network.observations
        .filter((o) => o.observerId === observerId)
        .map((o) => ({ reference: network.reference.get(o.day) as number, raw: o.raw }));
      const trueK = network.trueK.get(observerId) as number;
      const estimate = estimateK(pairs, "ratio-of-sums");
      expect(estimate.n).toBe(60);
      expect(estimate.meetsMinimum).toBe(true);
      expect(Math.abs((estimate.k as number) / trueK - 1)).toBeLessThan(0.02);
      // The other two methods are less efficient; hold them to 4 of their own sigma.
      for (const method of ["mean-of-ratios", "median-of-ratios"] as const) {
        const other = estimateK(pairs, method);
        expect(Math.abs((other.k as number) - trueK)).toBeLessThan(4 * (other.sigma as number));
      }
    }
  });

  it("reports a sigma that matches the actual scatter of k (ratio of sums, mean of ratios)", () => {
    // Typical activity (40–150) and Poisson-like noise: errors of a few per
    // cent. Over 40 networks × 12 observers the RMS of (k̂ − k)/sigma should
    // be close to 1 if sigma is an honest standard uncertainty.
    const zByMethod = new Map<string, number[]>();
    for (let seed = 1; seed <= 40; seed++) {
      const network = generateSyntheticNetwork({
        seed: 1000 + seed,
        observerCount: 12,
        dayCount: 60,
        noise: "poisson",
        activityMinimum: 40,
        activityMaximum: 150,
      });
      for (const observerId of network.observerIds) {
        const pairs = network.observations
          .filter((o) => o.observerId === observerId)
          .map((o) => ({ reference: network.reference.get(o.day) as number, raw: o.raw }));
        for (const method of K_METHODS) {
          const estimate = estimateK(pairs, method);
          const z =
            ((estimate.k as number) - (network.trueK.get(observerId) as number)) / (estimate.sigma as number);
          zByMethod.set(method, [...(zByMethod.get(method) ?? []), z]);
        }
      }
    }
    const rms = (values: number[]) => Math.sqrt(values.reduce((sum, z) => sum + z * z, 0) / values.length);
    const mean = (values: number[]) => values.reduce((sum, z) => sum + z, 0) / values.length;
    const ratioOfSums = zByMethod.get("ratio-of-sums") as number[];
    expect(rms(ratioOfSums)).toBeGreaterThan(0.85);
    expect(rms(ratioOfSums)).toBeLessThan(1.15);
    expect(Math.abs(mean(ratioOfSums))).toBeLessThan(0.15);
    // The asymptotic median formula is rougher at n = 60.
    const median = zByMethod.get("median-of-ratios") as number[];
    expect(rms(median)).toBeGreaterThan(0.7);
    expect(rms(median)).toBeLessThan(1.3);
    // Mean of ratios carries the documented upward bias of 1/raw with noisy
    // raw counts (about +1.5% here, comparable to its sigma): visible as a
    // positive mean z. This pins the reason ratio of sums is the default.
    const meanOfRatios = zByMethod.get("mean-of-ratios") as number[];
    expect(mean(meanOfRatios)).toBeGreaterThan(0.3);
  });
});

describe("detectKDrift", () => {
  it("flags a relative change beyond maxFraction and reports its z-score", () => {
    // Worked by hand: 0.92 / 0.80 − 1 = 0.15; z = 0.12 / √(0.02² + 0.03²) = 0.12 / 0.0360555 = 3.328.
    const drift = detectKDrift({
      previous: { k: 0.8, sigma: 0.02 },
      current: { k: 0.92, sigma: 0.03 },
      maxFraction: 0.1,
    });
    expect(drift.isDrift).toBe(true);
    expect(drift.relativeChange).toBeCloseTo(0.15, 12);
    expect(drift.zScore).toBeCloseTo(3.328, 3);
  });

  it("does not flag a change within maxFraction, either direction", () => {
    expect(detectKDrift({ previous: { k: 1 }, current: { k: 0.95 }, maxFraction: 0.1 }).isDrift).toBe(false);
    expect(detectKDrift({ previous: { k: 1 }, current: { k: 0.85 }, maxFraction: 0.1 }).isDrift).toBe(true);
    expect(detectKDrift({ previous: { k: 1 }, current: { k: 1.05 } }).isDrift).toBe(false);
  });

  it("gives null numbers when a k or a sigma is missing", () => {
    expect(detectKDrift({ previous: { k: null }, current: { k: 1 } })).toEqual({
      isDrift: false,
      relativeChange: null,
      zScore: null,
    });
    expect(
      detectKDrift({ previous: { k: 1, sigma: null }, current: { k: 1.5, sigma: 0.1 } }).zScore,
    ).toBeNull();
    expect(detectKDrift({ previous: { k: 1, sigma: 0 }, current: { k: 1.5, sigma: 0 } }).zScore).toBeNull();
  });

  it("works with estimateK results directly", () => {
    const random = createRandom(7);
    const days = Array.from({ length: 60 }, () => 80 + 60 * random());
    const before = estimateK(
      days.map((reference) => ({
        reference,
        raw: drawCount({ mean: reference / 0.8, noise: "poisson", random }),
      })),
    );
    const after = estimateK(
      days.map((reference) => ({
        reference,
        raw: drawCount({ mean: reference / 1.0, noise: "poisson", random }),
      })),
    );
    const drift = detectKDrift({ previous: before, current: after });
    expect(drift.isDrift).toBe(true);
    expect(drift.zScore as number).toBeGreaterThan(5);
  });
});
