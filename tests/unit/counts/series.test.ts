import { describe, expect, it } from "vitest";

import {
  accumulateDay,
  addToSums,
  computeDailyIndex,
  computeMonthlyMeans,
  computeYearlyMeans,
  EMPTY_DAY_SUMS,
  EMPTY_SUMS,
  finaliseDay,
  formatDayNumber,
  removeFromSums,
  type ScaledObservation,
  smoothed13,
  splitMonthIndex,
  summariseSums,
  toDayNumber,
  toDenseMonthlySeries,
  toMonthIndex,
  withdrawFromDay,
  type DailyIndexEntry,
} from "@/lib/counts/series";

import { createRandom } from "./helpers";

describe("day numbers", () => {
  it("counts days from 1970-01-01", () => {
    expect(toDayNumber("1970-01-01")).toBe(0);
    expect(toDayNumber("1970-01-02")).toBe(1);
    expect(toDayNumber("1969-12-31")).toBe(-1);
    expect(toDayNumber(12_345)).toBe(12_345);
  });

  it("agrees with the JavaScript Date UTC calendar over four centuries (independent check)", () => {
    const random = createRandom(3);
    for (let i = 0; i < 2000; i++) {
      const ms = Date.UTC(1700, 0, 1) + Math.floor(random() * 400 * 365.25) * 86_400_000;
      const iso = new Date(ms).toISOString().slice(0, 10);
      expect(toDayNumber(iso)).toBe(ms / 86_400_000);
      expect(formatDayNumber(ms / 86_400_000)).toBe(iso);
    }
  });

  it("handles leap years, including the century rule", () => {
    expect(toDayNumber("2024-03-01") - toDayNumber("2024-02-28")).toBe(2);
    expect(toDayNumber("2000-03-01") - toDayNumber("2000-02-28")).toBe(2);
    expect(toDayNumber("1900-03-01") - toDayNumber("1900-02-28")).toBe(1);
    expect(() => toDayNumber("2023-02-29")).toThrow(RangeError);
    expect(() => toDayNumber("1900-02-29")).toThrow(RangeError);
  });

  it("rejects malformed days", () => {
    for (const bad of [
      "2024-1-05",
      "2024/01/05",
      "2024-13-01",
      "2024-00-10",
      "2024-04-31",
      "24-01-05",
      "2024-01-0a",
    ]) {
      expect(() => toDayNumber(bad)).toThrow(RangeError);
    }
    expect(() => toDayNumber(1.5)).toThrow(RangeError);
  });

  it("covers exactly the years YYYY-MM-DD can express", () => {
    // Independent check: Date parses ISO dates in UTC, including year 0000.
    expect(toDayNumber("0000-01-01")).toBe(Date.parse("0000-01-01") / 86_400_000);
    expect(toDayNumber("9999-12-31")).toBe(Date.parse("9999-12-31") / 86_400_000);
    expect(formatDayNumber(toDayNumber("0000-01-01"))).toBe("0000-01-01");
    expect(() => toDayNumber(toDayNumber("0000-01-01") - 1)).toThrow(RangeError);
    expect(() => toDayNumber(toDayNumber("9999-12-31") + 1)).toThrow(RangeError);
  });

  it("numbers months consecutively across year ends", () => {
    expect(toMonthIndex({ year: 2024, month: 12 }) + 1).toBe(toMonthIndex({ year: 2025, month: 1 }));
    expect(splitMonthIndex(toMonthIndex({ year: 2019, month: 7 }))).toEqual({ year: 2019, month: 7 });
  });
});

// Worked by hand (one day, three observers):
//   A: k = 1.00, g = 2, s = 10 → 1.00 · 30 = 30   north 1/6 → 16, south 1/4 → 14
//   B: k = 0.80, g = 4, s = 10 → 0.80 · 50 = 40   north 3/8 → 30.4, south 1/2 → 9.6
//   C: k = 1.25, g = 3, s = 10 → 1.25 · 40 = 50   (no hemisphere split)
// total: mean 40, sample SD √((10² + 0 + 10²)/2) = 10, 3 observers
// north: mean (16 + 30.4)/2 = 23.2, SD 14.4/√2 = 10.1823; south: (14 + 9.6)/2 = 11.8, SD 4.4/√2 = 3.1113
const HAND_DAY: ScaledObservation[] = [
  {
    day: "2024-05-10",
    k: 1,
    groups: 2,
    spots: 10,
    northGroups: 1,
    northSpots: 6,
    southGroups: 1,
    southSpots: 4,
  },
  {
    day: "2024-05-10",
    k: 0.8,
    groups: 4,
    spots: 10,
    northGroups: 3,
    northSpots: 8,
    southGroups: 1,
    southSpots: 2,
  },
  {
    day: "2024-05-10",
    k: 1.25,
    groups: 3,
    spots: 10,
    northGroups: null,
    northSpots: null,
    southGroups: null,
    southSpots: null,
  },
];

describe("computeDailyIndex", () => {
  it("matches the hand-worked day", () => {
    const [day] = computeDailyIndex(HAND_DAY);
    expect(day?.day).toBe("2024-05-10");
    expect(day?.dayNumber).toBe(toDayNumber("2024-05-10"));
    expect(day?.relativeNumber).toBeCloseTo(40, 12);
    expect(day?.count).toBe(3);
    expect(day?.sd).toBeCloseTo(10, 10);
    expect(day?.north?.relativeNumber).toBeCloseTo(23.2, 12);
    expect(day?.north?.count).toBe(2);
    expect(day?.north?.sd).toBeCloseTo(10.1823, 4);
    expect(day?.south?.relativeNumber).toBeCloseTo(11.8, 12);
    expect(day?.south?.sd).toBeCloseTo(3.1113, 4);
  });

  it("sorts days, gives SD null for a single observer and hemispheres null without any split", () => {
    const daily = computeDailyIndex([
      { day: 19_900, k: 1, groups: 1, spots: 3 },
      { day: "2024-05-10", k: 1, groups: 0, spots: 0 },
      { day: 19_000, k: 0.5, groups: 2, spots: 4 },
    ]);
    expect(daily.map((d) => d.dayNumber)).toEqual([19_000, 19_853, 19_900]);
    expect(daily[0]).toMatchObject({ relativeNumber: 12, count: 1, sd: null, north: null, south: null });
    expect(daily[1]?.relativeNumber).toBe(0);
  });

  it("returns an empty list for no observations and throws on an invalid one", () => {
    expect(computeDailyIndex([])).toEqual([]);
    expect(() => computeDailyIndex([{ day: 1, k: 0, groups: 1, spots: 1 }])).toThrow(RangeError);
    expect(() => computeDailyIndex([{ day: 1, k: 1, groups: -1, spots: 1 }])).toThrow(RangeError);
  });

  it("handles days spread over a huge span (sparse day slots)", () => {
    const daily = computeDailyIndex([
      { day: -200_000, k: 1, groups: 1, spots: 1 },
      { day: 300_000, k: 1, groups: 2, spots: 2 },
      { day: -200_000, k: 1, groups: 1, spots: 3 },
    ]);
    expect(daily.map((d) => [d.dayNumber, d.relativeNumber, d.count])).toEqual([
      [-200_000, 12, 2],
      [300_000, 22, 1],
    ]);
  });

  it("gives exactly what folding accumulateDay / finaliseDay gives, for every day", () => {
    const random = createRandom(5);
    const observations: ScaledObservation[] = [];
    for (let i = 0; i < 3000; i++) {
      const groups = Math.floor(random() * 8);
      const spots = groups === 0 ? 0 : groups + Math.floor(random() * 40);
      const northGroups = Math.floor(random() * (groups + 1));
      const split = random() < 0.5;
      observations.push({
        day: 20_000 + Math.floor(random() * 90),
        k: 0.6 + 0.8 * random(),
        groups,
        spots,
        ...(split
          ? {
              northGroups,
              northSpots: northGroups,
              southGroups: groups - northGroups,
              southSpots: spots - northGroups,
            }
          : {}),
      });
    }
    const sumsByDay = new Map<number, typeof EMPTY_DAY_SUMS>();
    for (const observation of observations) {
      const day = toDayNumber(observation.day);
      sumsByDay.set(day, accumulateDay({ sums: sumsByDay.get(day) ?? EMPTY_DAY_SUMS, observation }));
    }
    const folded = [...sumsByDay.entries()]
      .sort((a, b) => a[0] - b[0])
      .map(([day, sums]) => finaliseDay({ day, sums }));
    expect(computeDailyIndex(observations)).toEqual(folded);
  });
});

describe("incremental day updates", () => {
  it("withdrawFromDay undoes accumulateDay, so an edited count costs O(1)", () => {
    const [a, b, c] = HAND_DAY as [ScaledObservation, ScaledObservation, ScaledObservation];
    let sums = EMPTY_DAY_SUMS;
    for (const observation of [a, b, c]) sums = accumulateDay({ sums, observation });
    // B is corrected from 4 groups to 5: take the old count out, put the new one in.
    sums = withdrawFromDay({ sums, observation: b });
    sums = accumulateDay({ sums, observation: { ...b, groups: 5, northGroups: 4 } });
    const fromScratch = computeDailyIndex([a, { ...b, groups: 5, northGroups: 4 }, c])[0];
    const updated = finaliseDay({ day: "2024-05-10", sums });
    expect(updated?.relativeNumber).toBeCloseTo(fromScratch?.relativeNumber as number, 12);
    expect(updated?.sd).toBeCloseTo(fromScratch?.sd as number, 9);
    expect(updated?.north?.relativeNumber).toBeCloseTo(fromScratch?.north?.relativeNumber as number, 12);
  });

  it("returns to exact zeros when the last value is removed, and refuses to go below", () => {
    const one = addToSums({ sums: EMPTY_SUMS, value: 0.1 + 0.2 });
    expect(removeFromSums({ sums: one, value: 0.3 })).toEqual({ n: 0, sum: 0, sumSquares: 0 });
    expect(() => removeFromSums({ sums: EMPTY_SUMS, value: 1 })).toThrow(RangeError);
    expect(finaliseDay({ day: 1, sums: EMPTY_DAY_SUMS })).toBeNull();
    expect(summariseSums(EMPTY_SUMS)).toBeNull();
  });
});

function makeDay(day: string, relativeNumber: number, north?: number, south?: number): DailyIndexEntry {
  const value = (r: number | undefined) =>
    r === undefined ? null : { relativeNumber: r, count: 1, sd: null };
  return {
    day,
    dayNumber: toDayNumber(day),
    relativeNumber,
    count: 1,
    sd: null,
    north: value(north),
    south: value(south),
  };
}

describe("monthly and yearly means", () => {
  // Worked by hand: January 10, 20, 60 → 30 over 3 days; February one day
  // of 11; March none; April 0 and 40 → 20. Northern values only in January
  // (4, 8 → 6 over 2 days). Year: (10 + 20 + 60 + 11 + 0 + 40)/6 = 23.5.
  const daily = [
    makeDay("2023-01-03", 10, 4, 6),
    makeDay("2023-01-17", 20, 8, 12),
    makeDay("2023-01-31", 60),
    makeDay("2023-02-14", 11),
    makeDay("2023-04-01", 0),
    makeDay("2023-04-30", 40),
    makeDay("2024-01-01", 100),
  ];

  it("averages over the days with data and counts them", () => {
    const monthly = computeMonthlyMeans([...daily].reverse());
    expect(monthly.map((m) => [m.year, m.month, m.relativeNumber, m.count])).toEqual([
      [2023, 1, 30, 3],
      [2023, 2, 11, 1],
      [2023, 4, 20, 2],
      [2024, 1, 100, 1],
    ]);
    expect(monthly[0]?.north).toEqual({ relativeNumber: 6, count: 2 });
    expect(monthly[0]?.south).toEqual({ relativeNumber: 9, count: 2 });
    expect(monthly[1]?.north).toBeNull();
    expect(monthly[0]?.monthIndex).toBe(toMonthIndex({ year: 2023, month: 1 }));
  });

  it("gives the yearly mean over days, not over months", () => {
    const yearly = computeYearlyMeans(daily);
    expect(yearly.map((y) => [y.year, y.relativeNumber, y.count])).toEqual([
      [2023, 23.5, 6],
      [2024, 100, 1],
    ]);
  });

  it("lays months out densely with nulls for gaps and thin months", () => {
    const monthly = computeMonthlyMeans(daily);
    const dense = toDenseMonthlySeries({ monthly });
    expect(dense.startMonthIndex).toBe(toMonthIndex({ year: 2023, month: 1 }));
    expect(dense.values).toEqual([30, 11, null, 20, null, null, null, null, null, null, null, null, 100]);
    expect(toDenseMonthlySeries({ monthly, minDayCount: 2 }).values.slice(0, 4)).toEqual([
      30,
      null,
      null,
      20,
    ]);
    expect(toDenseMonthlySeries({ monthly, hemisphere: "north" }).values.slice(0, 2)).toEqual([6, null]);
    const aligned = toDenseMonthlySeries({
      monthly,
      startMonthIndex: toMonthIndex({ year: 2022, month: 11 }),
      endMonthIndex: toMonthIndex({ year: 2023, month: 2 }),
    });
    expect(aligned.values).toEqual([null, null, 30, 11]);
    expect(toDenseMonthlySeries({ monthly: [] }).values).toEqual([]);
  });
});

describe("smoothed13", () => {
  it("matches a hand-worked value", () => {
    // Worked by hand: R(i) = i² for i = 0..12, centre n = 6:
    // [R(0) + 2(R(1) + … + R(11)) + R(12)] / 24 = [0 + 2·506 + 144] / 24 = 1156/24 = 48.1666…
    const squares = Array.from({ length: 13 }, (_, i) => i * i);
    const smoothed = smoothed13(squares);
    expect(smoothed[6]).toBeCloseTo(1156 / 24, 12);
    expect(smoothed.filter((v) => v !== null)).toHaveLength(1);
  });

  it("gives the end months of the window half weight (hand-worked)", () => {
    // Worked by hand: only R(n−6) = 12 and R(n+6) = 36 non-zero → (12 + 36)/24 = 2;
    // one step later R(n+5) = 36 has full weight and R(n−6) = 0 → 2·36/24 = 3.
    const values = [12, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 36, 0];
    const smoothed = smoothed13(values);
    expect(smoothed[6]).toBeCloseTo(2, 12);
    expect(smoothed[7]).toBeCloseTo(3, 12);
  });

  it("returns a constant series unchanged (common practice property: weights sum to 1)", () => {
    const smoothed = smoothed13(new Array<number>(40).fill(83.7));
    for (let i = 6; i < 34; i++) expect(smoothed[i]).toBeCloseTo(83.7, 10);
  });

  it("returns a linear series unchanged (common practice property: symmetric weights)", () => {
    const values = Array.from({ length: 40 }, (_, i) => 12.5 + 3.25 * i);
    const smoothed = smoothed13(values);
    for (let i = 6; i < 34; i++) expect(smoothed[i]).toBeCloseTo(values[i] as number, 10);
  });

  it("is null for the first and last six months and where any month in the window is missing", () => {
    const values: Array<number | null> = Array.from({ length: 30 }, (_, i) => 50 + i);
    values[15] = null;
    const smoothed = smoothed13(values);
    expect(smoothed).toHaveLength(30);
    for (let i = 0; i < 30; i++) {
      const expectValue = i >= 6 && i <= 23 && Math.abs(i - 15) > 6;
      expect(smoothed[i] !== null).toBe(expectValue);
    }
    expect(smoothed[8]).toBeCloseTo(58, 10);
    expect(smoothed[22]).toBeCloseTo(72, 10);
  });

  it("treats NaN as missing and copes with short arrays", () => {
    expect(smoothed13([])).toEqual([]);
    expect(smoothed13([1, 2, 3])).toEqual([null, null, null]);
    expect(smoothed13(new Array<number>(12).fill(5))).toEqual(new Array(12).fill(null));
    const thirteen = smoothed13(new Array<number>(13).fill(5));
    expect(thirteen.filter((v) => v !== null)).toEqual([5]);
    const withNaN = new Array<number>(13).fill(5);
    withNaN[0] = Number.NaN;
    expect(smoothed13(withNaN)[6]).toBeNull();
  });

  it("runs end to end from daily values to the smoothed series", () => {
    // 25 months of daily values 100 + month number: every month mean is
    // 100 + m exactly, so the smoothed series is that line again.
    const daily: DailyIndexEntry[] = [];
    for (let m = 0; m < 25; m++) {
      const { year, month } = splitMonthIndex(toMonthIndex({ year: 2020, month: 1 }) + m);
      for (const dayOfMonth of [2, 9, 16, 23]) {
        daily.push(
          makeDay(
            `${year}-${String(month).padStart(2, "0")}-${String(dayOfMonth).padStart(2, "0")}`,
            100 + m,
          ),
        );
      }
    }
    const dense = toDenseMonthlySeries({ monthly: computeMonthlyMeans(daily) });
    const smoothed = smoothed13(dense.values);
    expect(smoothed[12]).toBeCloseTo(112, 10);
    expect(smoothed.filter((v) => v !== null)).toHaveLength(13);
  });
});
