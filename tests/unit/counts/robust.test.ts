import { describe, expect, it } from "vitest";

import {
  computeMad,
  computeMedian,
  computeMedianInPlace,
  computeRobustScale,
  flagOutlier,
  flagUnusualSpotsPerGroup,
  MAD_TO_SIGMA,
} from "@/lib/counts/robust";

import { createRandom, drawGaussian } from "./helpers";

describe("computeMedian", () => {
  it("takes the middle value, or the mean of the middle two", () => {
    expect(computeMedian([5, 1, 3])).toBe(3);
    expect(computeMedian([4, 1, 3, 2])).toBe(2.5);
    expect(computeMedian([7])).toBe(7);
    expect(computeMedian([])).toBeNaN();
  });

  it("does not modify its input", () => {
    const values = [9, 2, 7, 4];
    computeMedian(values);
    expect(values).toEqual([9, 2, 7, 4]);
  });

  it("agrees with sorting on random, tied and ordered inputs", () => {
    const random = createRandom(9);
    for (let trial = 0; trial < 300; trial++) {
      const n = 1 + Math.floor(random() * 60);
      const kind = trial % 3;
      const values = Array.from({ length: n }, (_, i) =>
        kind === 0 ? random() * 100 : kind === 1 ? Math.floor(random() * 4) : i,
      );
      const sorted = [...values].sort((a, b) => a - b);
      const expected =
        n % 2
          ? (sorted[(n - 1) / 2] as number)
          : ((sorted[n / 2 - 1] as number) + (sorted[n / 2] as number)) / 2;
      expect(computeMedian(values)).toBe(expected);
      expect(computeMedianInPlace(Float64Array.from(values))).toBe(expected);
    }
  });

  it("uses only the first `length` values of a scratch buffer", () => {
    expect(computeMedianInPlace(Float64Array.from([3, 1, 2, 1000, 1000]), 3)).toBe(2);
  });
});

describe("computeMad", () => {
  it("scales the median absolute deviation by 1.4826", () => {
    // Worked by hand: [1, 2, 3, 4, 100] → median 3; |x − 3| = 2, 1, 0, 1, 97 → median 1 → 1.4826.
    expect(computeMad([1, 2, 3, 4, 100])).toBeCloseTo(MAD_TO_SIGMA, 12);
    expect(computeMad([])).toBeNaN();
    expect(computeMad([5, 5, 5])).toBe(0);
  });

  it("estimates σ for normal data", () => {
    const random = createRandom(17);
    const values = Array.from({ length: 20_000 }, () => 50 + 4 * drawGaussian(random));
    expect(computeMad(values)).toBeGreaterThan(3.9);
    expect(computeMad(values)).toBeLessThan(4.1);
  });

  it("falls back to the mean absolute deviation when the MAD is 0", () => {
    // Worked by hand: [0, 0, 0, 0, 11] → MAD 0; mean |x − 0| = 11/5 = 2.2; · 1.2533 = 2.75726.
    expect(computeRobustScale({ values: [0, 0, 0, 0, 11] }).scale).toBeCloseTo(2.75726, 5);
    expect(computeRobustScale({ values: [7, 7, 7], minScale: 1.5 }).scale).toBe(1.5);
  });
});

describe("flagOutlier", () => {
  // Worked by hand: day values 50, 52, 48, 51, 49, 50 → median 50;
  // |x − 50| = 0, 2, 2, 1, 1, 0 → median 1 → scale 1.4826.
  const dayValues = [50, 52, 48, 51, 49, 50];

  it("flags a value far from the day's median", () => {
    const flag = flagOutlier({ value: 80, dayValues });
    expect(flag.isOutlier).toBe(true);
    expect(flag.median).toBe(50);
    expect(flag.scale).toBeCloseTo(1.4826, 12);
    expect(flag.robustZ).toBeCloseTo(30 / 1.4826, 10);
    expect(flagOutlier({ value: 20, dayValues }).robustZ as number).toBeLessThan(-3);
  });

  it("passes a value inside the threshold and respects a custom threshold", () => {
    // z = 2 / 1.4826 = 1.349
    expect(flagOutlier({ value: 52, dayValues }).isOutlier).toBe(false);
    expect(flagOutlier({ value: 52, dayValues, threshold: 1 }).isOutlier).toBe(true);
    expect(flagOutlier({ value: 54.4, dayValues }).isOutlier).toBe(false); // z = 2.97
    expect(flagOutlier({ value: 54.5, dayValues }).isOutlier).toBe(true); // z = 3.04
  });

  it("is not fooled by the outliers it looks for (one wild value among the others)", () => {
    // With 137 typed for 17 among the comparison values, mean ± 3 SD would
    // pass everything; the median and MAD still flag a second wild value.
    const flag = flagOutlier({ value: 140, dayValues: [17, 18, 16, 137, 19, 17, 18] });
    expect(flag.median).toBe(18);
    expect(flag.isOutlier).toBe(true);
  });

  it("does not judge with too few comparison values", () => {
    expect(flagOutlier({ value: 500, dayValues: [10, 12] })).toEqual({
      isOutlier: false,
      robustZ: null,
      median: null,
      scale: null,
      n: 2,
    });
    expect(flagOutlier({ value: 500, dayValues: [10, 12], minValues: 2 }).isOutlier).toBe(true);
  });

  it("handles a day on which everyone else agrees exactly", () => {
    expect(flagOutlier({ value: 0, dayValues: [0, 0, 0, 0] })).toMatchObject({
      isOutlier: false,
      robustZ: 0,
    });
    expect(flagOutlier({ value: 11, dayValues: [0, 0, 0, 0] }).robustZ).toBe(Number.POSITIVE_INFINITY);
    expect(flagOutlier({ value: 11, dayValues: [0, 0, 0, 0], minScale: 5 }).isOutlier).toBe(false);
  });

  it("rejects a non-finite value", () => {
    expect(() => flagOutlier({ value: Number.NaN, dayValues })).toThrow(RangeError);
  });
});

describe("flagUnusualSpotsPerGroup", () => {
  // An observer who usually reports 6–10 spots per group.
  const random = createRandom(31);
  const history = Array.from({ length: 40 }, () => {
    const groups = 2 + Math.floor(random() * 6);
    return { groups, spots: Math.round(groups * (6 + 4 * random())) };
  });

  it("passes an ordinary day", () => {
    const flag = flagUnusualSpotsPerGroup({ groups: 4, spots: 31, history });
    expect(flag.isUnusual).toBe(false);
    expect(flag.reason).toBeNull();
    expect(flag.typicalSpotsPerGroup as number).toBeGreaterThan(6);
    expect(flag.typicalSpotsPerGroup as number).toBeLessThan(10);
    expect(flag.historyDays).toBe(40);
  });

  it("flags a day with far fewer spots per group than usual (groups counted as spots?)", () => {
    const flag = flagUnusualSpotsPerGroup({ groups: 10, spots: 12, history });
    expect(flag.isUnusual).toBe(true);
    expect(flag.reason).toBe("ratio-far-from-history");
    expect(flag.robustZ as number).toBeLessThan(-3);
    expect(flag.spotsPerGroup).toBe(1.2);
  });

  it("flags a day with far more spots per group than usual", () => {
    expect(flagUnusualSpotsPerGroup({ groups: 1, spots: 60, history }).robustZ as number).toBeGreaterThan(3);
  });

  it("does not flag an observer whose usual ratio is simply high", () => {
    const telescopeHistory = history.map(({ groups, spots }) => ({ groups, spots: spots * 3 }));
    expect(flagUnusualSpotsPerGroup({ groups: 4, spots: 96, history: telescopeHistory }).isUnusual).toBe(
      false,
    );
    expect(flagUnusualSpotsPerGroup({ groups: 4, spots: 96, history }).isUnusual).toBe(true);
  });

  it("always flags impossible pairs and skips days without groups", () => {
    expect(flagUnusualSpotsPerGroup({ groups: 0, spots: 5, history })).toMatchObject({
      isUnusual: true,
      reason: "spots-without-groups",
    });
    expect(flagUnusualSpotsPerGroup({ groups: 4, spots: 2, history })).toMatchObject({
      isUnusual: true,
      reason: "fewer-spots-than-groups",
    });
    expect(flagUnusualSpotsPerGroup({ groups: 0, spots: 0, history })).toMatchObject({
      isUnusual: false,
      reason: "no-groups",
    });
  });

  it("needs enough history, ignoring spotless history days", () => {
    const short = [...history.slice(0, 9), { groups: 0, spots: 0 }, { groups: 0, spots: 0 }];
    expect(flagUnusualSpotsPerGroup({ groups: 10, spots: 12, history: short })).toMatchObject({
      isUnusual: false,
      reason: "too-little-history",
      historyDays: 9,
    });
  });

  it("does not flag a one-spot change for an observer who always reports the same ratio", () => {
    const rigid = Array.from({ length: 20 }, () => ({ groups: 2, spots: 16 }));
    // ln(17/2) − ln(8) = 0.0606; the 0.05 floor gives z = 1.2.
    expect(flagUnusualSpotsPerGroup({ groups: 2, spots: 17, history: rigid }).isUnusual).toBe(false);
    expect(flagUnusualSpotsPerGroup({ groups: 2, spots: 30, history: rigid }).isUnusual).toBe(true);
  });
});
