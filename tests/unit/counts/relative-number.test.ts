import { describe, expect, it } from "vitest";

import {
  computeRawCount,
  computeRelativeNumber,
  findCountInconsistency,
  roundRelativeNumberForDisplay,
} from "@/lib/counts/relative-number";

describe("computeRawCount", () => {
  it("weights a group as ten spots: 10g + s", () => {
    // Worked by hand: 10·3 + 17 = 47.
    expect(computeRawCount({ groups: 3, spots: 17 })).toBe(47);
    expect(computeRawCount({ groups: 0, spots: 0 })).toBe(0);
  });

  it("counts a single spot that forms a new group as 11 (common practice)", () => {
    // Classical illustration of Wolf's weighting: one new group of one spot
    // raises the raw count from 0 to 10·1 + 1 = 11, never to 1.
    expect(computeRawCount({ groups: 1, spots: 1 })).toBe(11);
  });

  it("rejects counts that cannot come from an observation", () => {
    expect(() => computeRawCount({ groups: -1, spots: 3 })).toThrow(RangeError);
    expect(() => computeRawCount({ groups: 1, spots: 2.5 })).toThrow(RangeError);
    expect(() => computeRawCount({ groups: Number.NaN, spots: 3 })).toThrow(RangeError);
  });
});

describe("computeRelativeNumber", () => {
  it("gives R = k(10g + s) = 37.6 for g = 3, s = 17, k = 0.8 (worked by hand)", () => {
    // Worked by hand: 10·3 + 17 = 47; 0.8 · 47 = 37.6.
    const relativeNumber = computeRelativeNumber({ k: 0.8, groups: 3, spots: 17 });
    expect(relativeNumber).toBeCloseTo(37.6, 12);
    expect(roundRelativeNumberForDisplay({ relativeNumber })).toBe(37.6);
  });

  it("keeps full precision in the value and rounds only for display", () => {
    // Worked by hand: 0.613 · (10·7 + 52) = 0.613 · 122 = 74.786.
    const relativeNumber = computeRelativeNumber({ k: 0.613, groups: 7, spots: 52 });
    expect(relativeNumber).toBeCloseTo(74.786, 10);
    expect(roundRelativeNumberForDisplay({ relativeNumber })).toBe(74.8);
    expect(roundRelativeNumberForDisplay({ relativeNumber, decimals: 0 })).toBe(75);
    expect(roundRelativeNumberForDisplay({ relativeNumber, decimals: 2 })).toBe(74.79);
  });

  it("rounds products that land a hair below a half the way paper would", () => {
    // 0.15 · 10 is 1.4999999999999998 in binary floating point.
    expect(roundRelativeNumberForDisplay({ relativeNumber: 0.15 * 10, decimals: 0 })).toBe(2);
    expect(roundRelativeNumberForDisplay({ relativeNumber: 1.05, decimals: 1 })).toBe(1.1);
  });

  it("gives 11k for a lone spot and 0 for a spotless disk", () => {
    expect(computeRelativeNumber({ k: 1, groups: 1, spots: 1 })).toBe(11);
    expect(computeRelativeNumber({ k: 0.6, groups: 0, spots: 0 })).toBe(0);
  });

  it("rejects a k that is not a positive number", () => {
    expect(() => computeRelativeNumber({ k: 0, groups: 1, spots: 1 })).toThrow(RangeError);
    expect(() => computeRelativeNumber({ k: -0.8, groups: 1, spots: 1 })).toThrow(RangeError);
    expect(() => computeRelativeNumber({ k: Number.POSITIVE_INFINITY, groups: 1, spots: 1 })).toThrow(
      RangeError,
    );
  });
});

describe("findCountInconsistency", () => {
  it("accepts possible counts", () => {
    expect(findCountInconsistency({ groups: 0, spots: 0 })).toBeNull();
    expect(findCountInconsistency({ groups: 2, spots: 2 })).toBeNull();
    expect(findCountInconsistency({ groups: 2, spots: 30 })).toBeNull();
  });

  it("names the impossible ones", () => {
    expect(findCountInconsistency({ groups: 0, spots: 4 })).toBe("spots-without-groups");
    expect(findCountInconsistency({ groups: 5, spots: 3 })).toBe("fewer-spots-than-groups");
  });
});
