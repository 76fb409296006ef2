import { describe, expect, it } from "vitest";

import { MAD_TO_SIGMA } from "@/lib/counts/robust";
import {
  checkFarFromNetwork,
  checkHemispheres,
  checkSecondOfDay,
  checkSpotsPerGroup,
  computeAutomaticFlags,
  computeDayNetworkValue,
  DEFAULT_OUTLIER_THRESHOLD,
  NETWORK_MIN_SCALE,
} from "@/lib/review/flags";

const noSplit = { northGroups: null, northSpots: null, southGroups: null, southSpots: null };

describe("the day's robust network value", () => {
  it("is the median with the scaled MAD as spread (worked by hand)", () => {
    // Median 100; absolute deviations 40, 20, 0, 20, 40 → MAD 20 → σ = 1.4826 × 20.
    const value = computeDayNetworkValue({ values: [60, 80, 100, 120, 140] });
    expect(value?.median).toBe(100);
    expect(value?.scale).toBeCloseTo(MAD_TO_SIGMA * 20, 10);
    expect(value?.n).toBe(5);
  });

  it("keeps a floor on the spread when everyone agrees, and is null with no other counts", () => {
    expect(computeDayNetworkValue({ values: [50, 50, 50, 50] })?.scale).toBe(NETWORK_MIN_SCALE);
    expect(computeDayNetworkValue({ values: [] })).toBeNull();
  });
});

describe("(a) far from the day's network", () => {
  const others = [60, 80, 100, 120, 140];
  const sigma = MAD_TO_SIGMA * 20; // 29.652

  it("flags a value more than three robust σ from the median, and says by how much", () => {
    // (190 − 100) / 29.652 = 3.04 > 3.
    const flag = checkFarFromNetwork({ scaledValue: 190, otherScaledValues: others });
    expect(flag?.reason).toBe("far-from-network");
    expect(flag?.detail).toContain("3.0 robust σ above the day's network median of 100.0");
    expect(flag?.detail).toContain("5 other counts");
    // (185 − 100) / 29.652 = 2.87 < 3.
    expect(checkFarFromNetwork({ scaledValue: 185, otherScaledValues: others })).toBeNull();
    expect((185 - 100) / sigma).toBeLessThan(DEFAULT_OUTLIER_THRESHOLD);
  });

  it("flags low values too, and follows the configured threshold", () => {
    expect(checkFarFromNetwork({ scaledValue: 0, otherScaledValues: others })?.detail).toContain("below");
    expect(checkFarFromNetwork({ scaledValue: 170, otherScaledValues: others })).toBeNull();
    // (170 − 100) / 29.652 = 2.36 > 2.
    expect(checkFarFromNetwork({ scaledValue: 170, otherScaledValues: others, threshold: 2 })).not.toBeNull();
    expect(checkFarFromNetwork({ scaledValue: 190, otherScaledValues: others, threshold: 4 })).toBeNull();
  });

  it("is not fooled by another wild value that day (median and MAD, not mean and SD)", () => {
    const withTypo = [...others, 5000];
    // Median 110; deviations 50, 30, 10, 10, 30, 4890 → MAD 30 → σ 44.48; (250 − 110) / 44.48 = 3.15.
    expect(checkFarFromNetwork({ scaledValue: 250, otherScaledValues: withTypo })).not.toBeNull();
    const mean = withTypo.reduce((a, b) => a + b, 0) / withTypo.length;
    const sd = Math.sqrt(withTypo.reduce((a, b) => a + (b - mean) ** 2, 0) / (withTypo.length - 1));
    // The classical z-score would have hidden it behind the typo.
    expect(Math.abs(250 - mean) / sd).toBeLessThan(1);
  });

  it("judges nothing with fewer than three other counts", () => {
    expect(checkFarFromNetwork({ scaledValue: 900, otherScaledValues: [100, 110] })).toBeNull();
  });

  it("does not flag a one-group difference on a day when everyone else agrees exactly", () => {
    expect(checkFarFromNetwork({ scaledValue: 61, otherScaledValues: [50, 50, 50, 50] })).toBeNull();
    expect(checkFarFromNetwork({ scaledValue: 90, otherScaledValues: [50, 50, 50, 50] })).not.toBeNull();
  });
});

describe("(b) hemispheres against totals", () => {
  it("is silent when no split was given or the split adds up", () => {
    expect(checkHemispheres({ groups: 5, spots: 30, ...noSplit })).toBeNull();
    expect(
      checkHemispheres({
        groups: 5,
        spots: 30,
        northGroups: 3,
        northSpots: 20,
        southGroups: 2,
        southSpots: 10,
      }),
    ).toBeNull();
  });

  it("flags sums that differ from the totals, naming the numbers", () => {
    const flag = checkHemispheres({
      groups: 5,
      spots: 30,
      northGroups: 3,
      northSpots: 20,
      southGroups: 1,
      southSpots: 12,
    });
    expect(flag?.reason).toBe("hemispheres-inconsistent");
    expect(flag?.detail).toContain("3 + 1 = 4, but the total is 5");
    expect(flag?.detail).toContain("20 + 12 = 32, but the total is 30");
  });

  it("flags a partial split and impossible hemisphere pairs", () => {
    expect(
      checkHemispheres({
        groups: 2,
        spots: 9,
        northGroups: 2,
        northSpots: 9,
        southGroups: null,
        southSpots: null,
      })?.detail,
    ).toBe("Only 2 of the four hemisphere counts are given.");
    const flag = checkHemispheres({
      groups: 2,
      spots: 9,
      northGroups: 0,
      northSpots: 4,
      southGroups: 2,
      southSpots: 5,
    });
    expect(flag?.detail).toContain("4 northern spots but no northern groups");
  });
});

describe("(c) unusual s/g for this observer", () => {
  // 30 accepted days of 10 groups with 56–64 spots: s/g between 5.6 and 6.4.
  const history = Array.from({ length: 30 }, (_, i) => ({ groups: 10, spots: 60 + ((i % 5) - 2) * 2 }));

  it("flags a slipped digit against the observer's own history", () => {
    const flag = checkSpotsPerGroup({ groups: 10, spots: 300, history });
    expect(flag?.reason).toBe("unusual-spots-per-group");
    expect(flag?.detail).toContain("s/g = 30.0 against a usual 6.0");
    expect(flag?.detail).toContain("above");
  });

  it("leaves a usual ratio alone", () => {
    expect(checkSpotsPerGroup({ groups: 8, spots: 49, history })).toBeNull();
  });

  it("allows for counting noise on a day with few spots", () => {
    // ln(3/6) = −0.69 is 14 history σ off (floor 0.05), but with one group
    // and three spots the count's own noise is sqrt((3 − 1) / 3²) = 0.47,
    // so the combined z is about −1.5: not worth the coordinator's time.
    expect(checkSpotsPerGroup({ groups: 1, spots: 3, history })).toBeNull();
  });

  it("always flags impossible pairs from older or imported rows", () => {
    expect(checkSpotsPerGroup({ groups: 0, spots: 4, history: [] })?.detail).toBe(
      "4 spots but no groups: every spot belongs to a group.",
    );
    expect(checkSpotsPerGroup({ groups: 5, spots: 3, history: [] })?.detail).toContain(
      "3 spots for 5 groups",
    );
  });

  it("does not judge an observer with too little history", () => {
    expect(checkSpotsPerGroup({ groups: 10, spots: 300, history: history.slice(0, 5) })).toBeNull();
  });
});

describe("(d) a second count the same UT day", () => {
  it("flags when the observer has another count with the same instrument that day", () => {
    expect(checkSecondOfDay({ utDate: "2026-11-20", siblings: [] })).toBeNull();
    const flag = checkSecondOfDay({
      utDate: "2026-11-20",
      siblings: [{ observedAt: new Date("2026-11-20T09:12:00Z") }],
    });
    expect(flag).toEqual({
      reason: "second-of-the-day",
      detail: "This observer logged another count with the same instrument on 2026-11-20 (at 09:12 UT).",
    });
  });
});

describe("computeAutomaticFlags", () => {
  it("scales by the observer's k before comparing with the network", () => {
    const base = {
      utDate: "2026-11-20",
      ...noSplit,
      history: [],
      siblings: [],
      otherScaledValues: [95, 100, 105, 100],
    };
    // Raw 10·10 + 100 = 200; with k = 0.5 the scaled value 100 sits on the median.
    expect(computeAutomaticFlags({ ...base, groups: 10, spots: 100, k: 0.5 })).toEqual([]);
    expect(computeAutomaticFlags({ ...base, groups: 10, spots: 100, k: 1 }).map((f) => f.reason)).toEqual([
      "far-from-network",
    ]);
  });

  it("returns every flag that applies, in a stable order", () => {
    const flags = computeAutomaticFlags({
      utDate: "2026-11-20",
      groups: 3,
      spots: 2,
      northGroups: 1,
      northSpots: 1,
      southGroups: 1,
      southSpots: 1,
      k: 1,
      otherScaledValues: [100, 110, 90, 105],
      history: [],
      siblings: [{ observedAt: new Date("2026-11-20T08:00:00Z") }],
    });
    expect(flags.map((f) => f.reason)).toEqual([
      "far-from-network",
      "hemispheres-inconsistent",
      "unusual-spots-per-group",
      "second-of-the-day",
    ]);
  });
});
