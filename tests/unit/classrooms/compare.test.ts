import { describe, expect, it } from "vitest";

import {
  alignClassMedians,
  buildTermTable,
  compareSessionCounts,
  computeClassK,
  computeQuantile,
  computeSessionMedians,
  computeSpread,
  computeTermKs,
  findSettledAfter,
  summariseSettling,
} from "@/lib/classrooms/compare";

// Worked by hand throughout: 10g + s is Wolf's raw count (common practice).
const session = [
  { studentId: "a", displayName: "Ava P.", groups: 3, spots: 12 }, // 42
  { studentId: "b", displayName: "Ben K.", groups: 4, spots: 20 }, // 60
  { studentId: "c", displayName: "Chloe R.", groups: 2, spots: 7 }, // 27
  { studentId: "d", displayName: "Dev S.", groups: 3, spots: 15 }, // 45
];

describe("compareSessionCounts", () => {
  it("gives every student's 10g + s, the class medians and each difference from the median", () => {
    const result = compareSessionCounts({ counts: session });
    expect(result.n).toBe(4);
    // Medians of g (2,3,3,4), s (7,12,15,20) and 10g+s (27,42,45,60), each taken on its own.
    expect(result.median).toEqual({ groups: 3, spots: 13.5, raw: 43.5 });
    expect(result.rows.map((r) => r.raw)).toEqual([42, 60, 27, 45]);
    expect(result.rows.map((r) => r.differenceFromMedian)).toEqual([-1.5, 16.5, -16.5, 1.5]);
    expect(result.rows[1]?.relativeDifference).toBeCloseTo(16.5 / 43.5, 12);
    expect(result.rows[0]?.displayName).toBe("Ava P.");
  });

  it("describes the spread of 10g + s by range, quartiles and scaled MAD", () => {
    const { spread } = compareSessionCounts({ counts: session });
    // Quartiles by linear interpolation (Hyndman & Fan definition 7, numpy's default):
    // Q1 = 27 + 0.75·(42 − 27) = 38.25, Q3 = 45 + 0.25·(60 − 45) = 48.75.
    expect(spread).toMatchObject({
      min: 27,
      max: 60,
      range: 33,
      lowerQuartile: 38.25,
      upperQuartile: 48.75,
      interquartileRange: 10.5,
    });
    // |x − 43.5| = 16.5, 1.5, 16.5, 1.5 → median 9 → × 1.4826 = 13.3434.
    expect(spread?.mad).toBeCloseTo(13.3434, 10);
  });

  it("sets the network's value for the day beside the class median", () => {
    const { network } = compareSessionCounts({ counts: session, networkValue: 58 });
    expect(network?.value).toBe(58);
    expect(network?.ratioToClassMedian).toBeCloseTo(58 / 43.5, 12);
    expect(compareSessionCounts({ counts: session }).network).toBeNull();
  });

  it("has no median, spread or ratio when nobody has counted yet", () => {
    const result = compareSessionCounts({ counts: [], networkValue: 40 });
    expect(result).toMatchObject({ n: 0, median: null, spread: null, rows: [] });
    expect(result.network).toEqual({ value: 40, ratioToClassMedian: null });
  });

  it("does not divide by a zero median on a spotless day", () => {
    const result = compareSessionCounts({
      counts: [
        { studentId: "a", displayName: "A", groups: 0, spots: 0 },
        { studentId: "b", displayName: "B", groups: 0, spots: 0 },
        { studentId: "c", displayName: "C", groups: 1, spots: 1 },
      ],
      networkValue: 5,
    });
    expect(result.median?.raw).toBe(0);
    expect(result.rows.map((r) => r.relativeDifference)).toEqual([null, null, null]);
    expect(result.rows[2]?.differenceFromMedian).toBe(11);
    expect(result.network?.ratioToClassMedian).toBeNull();
  });

  it("refuses a count that cannot be a count", () => {
    expect(() =>
      compareSessionCounts({ counts: [{ studentId: "a", displayName: "A", groups: -1, spots: 0 }] }),
    ).toThrow(RangeError);
  });
});

describe("computeQuantile and computeSpread", () => {
  it("interpolates between order statistics", () => {
    expect(computeQuantile([10], 0.25)).toBe(10);
    expect(computeQuantile([10, 20], 0.5)).toBe(15);
    expect(computeQuantile([1, 2, 3, 4, 5], 0.25)).toBe(2);
    expect(Number.isNaN(computeQuantile([], 0.5))).toBe(true);
  });

  it("gives no spread for one student", () => {
    expect(computeSpread([33])).toEqual({
      min: 33,
      max: 33,
      range: 0,
      lowerQuartile: 33,
      upperQuartile: 33,
      interquartileRange: 0,
      mad: 0,
    });
    expect(() => computeSpread([])).toThrow(RangeError);
  });
});

// Three sessions; Ben counts half the median, Chloe one and a half times it and misses the third.
const term = [
  {
    sessionId: "s3",
    day: "2026-09-23",
    counts: [
      { studentId: "a", raw: 30 },
      { studentId: "b", raw: 15 },
    ],
  },
  {
    sessionId: "s1",
    day: "2026-09-09",
    counts: [
      { studentId: "a", raw: 40 },
      { studentId: "b", raw: 20 },
      { studentId: "c", raw: 60 },
    ],
  },
  {
    sessionId: "s2",
    day: "2026-09-16",
    counts: [
      { studentId: "a", raw: 50 },
      { studentId: "b", raw: 25 },
      { studentId: "c", raw: 75 },
    ],
  },
];

describe("computeTermKs", () => {
  it("takes the class median per session, in time order", () => {
    expect(computeSessionMedians(term)).toEqual([
      { sessionId: "s1", day: "2026-09-09", n: 3, median: 40 },
      { sessionId: "s2", day: "2026-09-16", n: 3, median: 50 },
      { sessionId: "s3", day: "2026-09-23", n: 2, median: 22.5 },
    ]);
  });

  it("fits each student's k against the class median with estimateK", () => {
    const { students } = computeTermKs({ sessions: term, minSessions: 3 });
    const byId = Object.fromEntries(students.map((s) => [s.studentId, s]));
    // Ratio of sums: Σ median / Σ raw. Ben: (40 + 50 + 22.5) / (20 + 25 + 15) = 112.5 / 60.
    expect(byId.b?.estimate.k).toBeCloseTo(1.875, 12);
    expect(byId.a?.estimate.k).toBeCloseTo(112.5 / 120, 12);
    // Chloe missed the third session: (40 + 50) / (60 + 75).
    expect(byId.c?.estimate.k).toBeCloseTo(90 / 135, 12);
    expect(byId.c?.sessionsCounted).toBe(2);
    expect(byId.b?.estimate.meetsMinimum).toBe(true);
    expect(byId.c?.estimate.meetsMinimum).toBe(false);
  });

  it("shows how each k settles as sessions add up", () => {
    const { students } = computeTermKs({ sessions: term });
    const ben = students.find((s) => s.studentId === "b");
    expect(ben?.settling.map((step) => [step.sessionCount, step.day, step.k])).toEqual([
      [1, "2026-09-09", 2],
      [2, "2026-09-16", 2],
      [3, "2026-09-23", 1.875],
    ]);
    expect(ben?.settling[0]?.sigma).toBeNull();
    // Every running k is within 10% of 1.875, for three sessions: settled from the first.
    expect(ben?.settledAfter).toBe(1);
  });

  it("uses the method asked for", () => {
    const { students } = computeTermKs({ sessions: term, method: "median-of-ratios" });
    // Ben's ratios are all exactly 2, 2 and 1.5: median 2.
    expect(students.find((s) => s.studentId === "b")?.estimate).toMatchObject({
      k: 2,
      method: "median-of-ratios",
    });
  });

  it("gives no k for a student whose every count was 0", () => {
    const { students } = computeTermKs({
      sessions: [
        {
          sessionId: "x",
          day: "2026-10-01",
          counts: [
            { studentId: "z", raw: 0 },
            { studentId: "y", raw: 22 },
            { studentId: "w", raw: 30 },
          ],
        },
      ],
    });
    const z = students.find((s) => s.studentId === "z");
    expect(z?.estimate.k).toBeNull();
    expect(z?.settledAfter).toBeNull();
  });

  it("does not depend on the order sessions arrive in", () => {
    const forward = computeTermKs({ sessions: term });
    const backward = computeTermKs({ sessions: [...term].reverse() });
    expect(backward.medians).toEqual(forward.medians);
    expect(backward.students.map((s) => s.estimate.k).sort()).toEqual(
      forward.students.map((s) => s.estimate.k).sort(),
    );
  });
});

describe("findSettledAfter", () => {
  const steps = (ks: Array<number | null>) => ks.map((k, i) => ({ sessionCount: i + 1, k }));

  it("finds the session from which the running k stays within 10% of the final k", () => {
    expect(findSettledAfter({ settling: steps([2, 1.5, 1.05, 1.02, 1]), finalK: 1 })).toBe(3);
  });

  it("waits for a run of three close values before calling k settled", () => {
    expect(findSettledAfter({ settling: steps([2, 1.5, 1.05, 1]), finalK: 1 })).toBeNull();
  });

  it("starts again after a jump back out of the band", () => {
    expect(findSettledAfter({ settling: steps([1, 1, 1.4, 1.02, 1.01, 1]), finalK: 1 })).toBe(4);
  });

  it("is null without a final k", () => {
    expect(findSettledAfter({ settling: steps([null]), finalK: null })).toBeNull();
  });
});

describe("computeClassK and alignClassMedians", () => {
  it("fits the class median against the network on days where both exist", () => {
    const estimate = computeClassK({
      days: [
        { classMedian: 40, networkValue: 60 },
        { classMedian: 50, networkValue: 70 },
        { classMedian: null, networkValue: 80 },
        { classMedian: 30, networkValue: null },
      ],
      minSessions: 2,
    });
    // (60 + 70) / (40 + 50).
    expect(estimate.k).toBeCloseTo(130 / 90, 12);
    expect(estimate).toMatchObject({ n: 2, meetsMinimum: true });
    expect(computeClassK({ days: [] }).k).toBeNull();
  });

  it("lines classes up by session day", () => {
    const rows = alignClassMedians([
      {
        medians: [
          { day: "2026-10-07", median: 30 },
          { day: "2026-09-30", median: 10 },
        ],
      },
      {
        medians: [
          { day: "2026-10-01", median: 20 },
          { day: "2026-10-07", median: 35 },
        ],
      },
    ]);
    expect(rows).toEqual([
      { day: "2026-09-30", values: [10, null] },
      { day: "2026-10-01", values: [null, 20] },
      { day: "2026-10-07", values: [30, 35] },
    ]);
  });
});

describe("buildTermTable", () => {
  it("gives one row per student with their k and counts, and the class median last", () => {
    const result = computeTermKs({ sessions: term, minSessions: 3 });
    const table = buildTermTable({
      students: [
        { studentId: "a", displayName: "Ava P." },
        { studentId: "b", displayName: "Ben K." },
        { studentId: "c", displayName: "Chloe R." },
        { studentId: "n", displayName: "New N." },
      ],
      sessions: term,
      term: result,
    });
    expect(table.header).toEqual([
      "Student",
      "Sessions counted",
      "k",
      "k uncertainty (±)",
      "Settled after (sessions)",
      "2026-09-09 10g+s",
      "2026-09-16 10g+s",
      "2026-09-23 10g+s",
    ]);
    expect(table.rows[1]).toEqual(["Ben K.", 3, 1.875, expect.any(Number), 1, 20, 25, 15]);
    expect(table.rows[2]?.slice(0, 3)).toEqual(["Chloe R.", 2, 0.667]);
    expect(table.rows[2]?.slice(5)).toEqual([60, 75, null]);
    // A student with no counts yet still has a row.
    expect(table.rows[3]).toEqual(["New N.", 0, null, null, null, null, null, null]);
    expect(table.rows[4]).toEqual(["Class median", null, null, null, null, 40, 50, 22.5]);
  });
});

describe("summariseSettling", () => {
  it("gives, per session count, the median distance of the running k from the term k", () => {
    const student = (ks: number[], finalK: number) => ({
      settling: ks.map((k, i) => ({
        sessionCount: i + 1,
        sessionId: `s${i}`,
        day: "2026-10-01",
        k,
        sigma: null,
      })),
      estimate: {
        k: finalK,
        n: ks.length,
        sigma: null,
        method: "ratio-of-sums" as const,
        meetsMinimum: true,
      },
    });
    const rows = summariseSettling([
      student([2, 1.2, 1], 1),
      student([0.5, 0.9, 1], 1),
      student([1.5, 1.1], 1),
    ]);
    // m = 1: |2 − 1|, |0.5 − 1|, |1.5 − 1| → 1, 0.5, 0.5 → median 0.5.
    // m = 2: 0.2, 0.1, 0.1 → 0.1. m = 3: two students, 0 and 0 → 0.
    expect(rows.map((r) => [r.sessionCount, r.students])).toEqual([
      [1, 3],
      [2, 3],
      [3, 2],
    ]);
    expect(rows[0]?.medianDeviation).toBeCloseTo(0.5, 12);
    expect(rows[1]?.medianDeviation).toBeCloseTo(0.1, 12);
    expect(rows[2]?.medianDeviation).toBe(0);
  });

  it("needs at least two students for a row", () => {
    const one = [
      {
        settling: [{ sessionCount: 1, sessionId: "a", day: "d", k: 1, sigma: null }],
        estimate: { k: 1, n: 1, sigma: null, method: "ratio-of-sums" as const, meetsMinimum: false },
      },
    ];
    expect(summariseSettling(one)).toEqual([]);
    expect(summariseSettling([])).toEqual([]);
  });
});
