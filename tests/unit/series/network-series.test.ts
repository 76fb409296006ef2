import { describe, expect, it } from "vitest";

import {
  computeDailyIndex,
  computeMonthlyMeans,
  computeYearlyMeans,
  formatDayNumber,
  toDayNumber,
} from "@/lib/counts/series";
import { appendCount, createAcceptedCounts, NO_SPLIT, sliceByKey } from "@/lib/series/accepted-counts";
import {
  appendDailyRows,
  dailyColumnsOf,
  dailyRowsOf,
  combineObserverCounts,
  computeNetworkSeries,
  computeSmoothedAt,
  summariseDay,
  summariseMonth,
  seriesFromDaily,
  seriesFromDailyColumns,
  type DailyColumns,
  summariseYear,
} from "@/lib/series/network-series";

import { createRandom } from "../counts/helpers";

describe("one day", () => {
  it("averages an observer's repeated counts before counting observers (worked by hand)", () => {
    const values = combineObserverCounts([
      { observerKey: "a", k: 0.5, raw: 40, northRaw: null, southRaw: null },
      { observerKey: "b", k: 1, raw: 30, northRaw: 20, southRaw: 10 },
      // a's second instrument: 1.0 × 30 = 30; a's day value is (20 + 30) / 2 = 25.
      { observerKey: "a", k: 1, raw: 30, northRaw: 12, southRaw: 18 },
    ]);
    expect(values).toEqual([
      { total: 25, north: 12, south: 18 },
      { total: 30, north: 20, south: 10 },
    ]);
    const rows = summariseDay({ day: "2024-05-01", values });
    // Whole disk: mean of 25 and 30 = 27.5; SD = √(((25−27.5)² + (30−27.5)²)/1) = 3.5355.
    expect(rows[0]).toMatchObject({
      day: "2024-05-01",
      hemisphere: "all",
      observers: 2,
      sum: 55,
      sumSquares: 1525,
      mean: 27.5,
    });
    expect(rows[0]!.sd).toBeCloseTo(Math.sqrt(12.5), 12);
    expect(rows[1]).toMatchObject({ hemisphere: "N", observers: 2, mean: 16 });
    expect(rows[2]).toMatchObject({ hemisphere: "S", observers: 2, mean: 14 });
  });

  it("leaves out a hemisphere no observer split, and has no SD with one observer", () => {
    const rows = summariseDay({ day: "2024-05-02", values: [{ total: 44, north: null, south: null }] });
    expect(rows).toEqual([
      { day: "2024-05-02", hemisphere: "all", observers: 1, sum: 44, sumSquares: 1936, mean: 44, sd: null },
    ]);
    expect(summariseDay({ day: "2024-05-03", values: [] })).toEqual([]);
  });
});

describe("months, years, smoothing", () => {
  it("means over days with data, and a year over all its days (not its months)", () => {
    expect(summariseMonth({ month: "2024-01", hemisphere: "all", dailyMeans: [10, 20, 30] })).toEqual({
      month: "2024-01",
      hemisphere: "all",
      days: 3,
      sumOfDailyMeans: 60,
      mean: 20,
    });
    expect(summariseMonth({ month: "2024-02", hemisphere: "N", dailyMeans: [] })).toBeNull();
    // A thin month (1 day at 100) and a full one (3 days at 10): (100 + 30) / 4 = 32.5, not (100 + 10) / 2.
    expect(
      summariseYear({
        year: 2024,
        hemisphere: "all",
        months: [
          { days: 1, sumOfDailyMeans: 100 },
          { days: 3, sumOfDailyMeans: 30 },
        ],
      }),
    ).toEqual({
      year: 2024,
      hemisphere: "all",
      days: 4,
      mean: 32.5,
    });
  });

  it("smooths one month from the 13 around it with the tapered weights", () => {
    // Means 1..13 centred on month 7: [1 + 2(2+…+12) + 13] / 24 = (14 + 2·77) / 24 = 7.
    const means = new Map(Array.from({ length: 13 }, (_, i) => [100 + i, i + 1]));
    expect(computeSmoothedAt({ monthIndex: 106, meanOfMonth: (m) => means.get(m) })).toBe(7);
    expect(computeSmoothedAt({ monthIndex: 105, meanOfMonth: (m) => means.get(m) })).toBeNull();
  });
});

describe("computeNetworkSeries", () => {
  it("gives the same daily, monthly and yearly values as lib/counts when each observer counts once a day", () => {
    const random = createRandom(5);
    const counts = createAcceptedCounts(16);
    const observations: Array<{
      day: number;
      k: number;
      groups: number;
      spots: number;
      northGroups: number | null;
      northSpots: number | null;
      southGroups: number | null;
      southSpots: number | null;
    }> = [];
    const kOfUnit = [0.8, 1.1, 1.3];
    const kOfRow: number[] = [];
    const first = toDayNumber("2023-11-20");
    for (let day = first; day < first + 500; day++) {
      for (let unit = 0; unit < 3; unit++) {
        if (random() < 0.3) continue;
        const groups = Math.floor(random() * 8);
        const spots = groups === 0 ? 0 : groups + Math.floor(random() * 30);
        const split = unit === 1 && groups > 0;
        const northGroups = split ? Math.floor(groups / 2) : null;
        const northSpots = split ? Math.floor(spots / 2) : null;
        appendCount(counts, {
          dayNumber: day,
          unit,
          raw: 10 * groups + spots,
          ...(split
            ? {
                northRaw: 10 * northGroups! + northSpots!,
                southRaw: 10 * (groups - northGroups!) + spots - northSpots!,
              }
            : {}),
        });
        kOfRow.push(kOfUnit[unit]!);
        observations.push({
          day,
          k: kOfUnit[unit]!,
          groups,
          spots,
          northGroups,
          northSpots,
          southGroups: split ? groups - northGroups! : null,
          southSpots: split ? spots - northSpots! : null,
        });
      }
    }
    const { daily, monthly, yearly } = computeNetworkSeries({
      counts,
      kOfRow: Float64Array.from(kOfRow),
      observerOfUnit: Int32Array.from([0, 1, 2]),
    });
    const expected = computeDailyIndex(observations);
    const all = daily.filter((d) => d.hemisphere === "all");
    expect(all).toHaveLength(expected.length);
    expected.forEach((entry, i) => {
      expect(all[i]!.day).toBe(entry.day);
      expect(all[i]!.mean).toBeCloseTo(entry.relativeNumber, 10);
      expect(all[i]!.observers).toBe(entry.count);
      const north = daily.find((d) => d.hemisphere === "N" && d.day === entry.day);
      expect(north?.mean ?? null).toEqual(
        entry.north ? expect.closeTo(entry.north.relativeNumber, 10) : null,
      );
    });
    const months = computeMonthlyMeans(expected);
    const storedMonths = monthly.filter((m) => m.hemisphere === "all");
    expect(storedMonths.map((m) => m.mean)).toEqual(months.map((m) => expect.closeTo(m.relativeNumber, 10)));
    const years = computeYearlyMeans(expected);
    expect(yearly.filter((y) => y.hemisphere === "all").map((y) => [y.year, y.days])).toEqual(
      years.map((y) => [y.year, y.count]),
    );
    // 2023-11 to 2025-04 is 18 months: all but the first and last six carry a smoothed value.
    expect(storedMonths).toHaveLength(18);
    expect(storedMonths.filter((m) => m.smoothed !== null).map((m) => m.month)).toEqual([
      "2024-05",
      "2024-06",
      "2024-07",
      "2024-08",
      "2024-09",
      "2024-10",
    ]);
  });

  it("counts an observer with two instruments once per day", () => {
    const counts = createAcceptedCounts(4);
    appendCount(counts, { dayNumber: 10, unit: 0, raw: 20 });
    appendCount(counts, { dayNumber: 10, unit: 1, raw: 40 });
    appendCount(counts, { dayNumber: 10, unit: 2, raw: 30 });
    const { daily } = computeNetworkSeries({
      counts,
      kOfRow: Float64Array.from([1, 1, 1]),
      observerOfUnit: Int32Array.from([0, 0, 1]),
    });
    expect(daily).toEqual([expect.objectContaining({ hemisphere: "all", observers: 2, mean: 30, sd: 0 })]);
  });
});

describe("daily rows a slice of days at a time", () => {
  it("gives the same series as all days at once", () => {
    const random = createRandom(7);
    const counts = createAcceptedCounts(0);
    for (let day = 19_000; day < 19_400; day++) {
      for (let unit = 0; unit < 4; unit++) {
        if (random() < 0.3) continue;
        const split = unit % 2 === 0;
        const raw = Math.floor(random() * 120);
        appendCount(counts, {
          dayNumber: day,
          unit,
          raw,
          northRaw: split ? Math.floor(raw / 3) : undefined,
          southRaw: split ? raw - Math.floor(raw / 3) : undefined,
        });
      }
    }
    const kOfRow = Float64Array.from({ length: counts.length }, () => 0.5 + random());
    const observerOfUnit = Int32Array.from([0, 1, 1, 2]);
    const whole = computeNetworkSeries({ counts, kOfRow, observerOfUnit });
    for (const days of [1, 7, 64]) {
      const daily: Parameters<typeof seriesFromDaily>[0] = [];
      const slices: DailyColumns[] = [];
      for (const { from, to } of sliceByKey({ counts, keyOf: (day) => Math.floor(day / days) })) {
        appendDailyRows({ counts, kOfRow, observerOfUnit, from, to, daily });
        slices.push(dailyColumnsOf({ counts, kOfRow, observerOfUnit, from, to }));
      }
      expect(seriesFromDaily(daily), `${days} days a slice`).toEqual(whole);
      // The full recompute's way: the same rows as columns, and the same
      // months and years from them.
      expect(slices.flatMap(dailyRowsOf), `${days} days a slice, as columns`).toEqual(whole.daily);
      expect(seriesFromDailyColumns(slices), `${days} days a slice, as columns`).toEqual({
        monthly: whole.monthly,
        yearly: whole.yearly,
      });
    }
    // One observer on a day has no spread: NaN in the columns, null in the rows.
    const columns = dailyColumnsOf({ counts, kOfRow, observerOfUnit, from: 0, to: counts.length });
    const single = whole.daily.findIndex((row) => row.sd === null);
    expect(single).toBeGreaterThanOrEqual(0);
    expect(columns.sd[single]).toBeNaN();
    expect(whole.daily.length).toBeGreaterThan(800);

    // The incremental refresh builds each day from database rows through
    // combineObserverCounts and summariseDay: the same rows, to the bit.
    const byDay = new Map<number, Parameters<typeof combineObserverCounts>[0][number][]>();
    for (let i = 0; i < counts.length; i++) {
      const day = counts.dayNumber[i]!;
      const split = counts.northRaw[i] !== NO_SPLIT;
      byDay.set(day, [
        ...(byDay.get(day) ?? []),
        {
          observerKey: String(observerOfUnit[counts.unit[i]!]),
          k: kOfRow[i]!,
          raw: counts.raw[i]!,
          northRaw: split ? counts.northRaw[i]! : null,
          southRaw: split ? counts.southRaw[i]! : null,
        },
      ]);
    }
    const incremental = [...byDay].flatMap(([day, scaled]) =>
      summariseDay({ day: formatDayNumber(day), values: combineObserverCounts(scaled) }),
    );
    expect(whole.daily).toEqual(incremental);
    expect(incremental.some((row) => row.hemisphere === "N")).toBe(true);
  });
});
