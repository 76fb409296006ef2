/**
 * The stored network series (PRODUCT.md, "Methods"): per UT day the mean of
 * k_i(10g_i + s_i) over the day's observers with its count and spread, the
 * monthly mean over days with data, the 13-month smoothed value and the
 * yearly mean, each for the whole disk ("all") and for each hemisphere.
 *
 * Both paths that fill the tables use these functions: the full recompute
 * (every day at once, from typed arrays) and the incremental refresh after a
 * review decision (a few days, from database rows). Sharing them is what
 * keeps an incrementally updated archive equal to a recomputed one.
 */

import { formatDayNumber, smoothed13, summariseSums } from "@/lib/counts/series";

import { NO_SPLIT, type AcceptedCounts } from "./accepted-counts";

/** The whole disk, or one hemisphere (a group belongs to the hemisphere of its centre). */
export type Hemisphere = "all" | "N" | "S";
export const SERIES_HEMISPHERES: readonly Hemisphere[] = ["all", "N", "S"];

export type DailyRow = {
  day: string;
  hemisphere: Hemisphere;
  observers: number;
  sum: number;
  sumSquares: number;
  mean: number;
  sd: number | null;
};

/**
 * Daily rows column by column, as the full recompute makes them and hands
 * them to the helper thread that writes them (a million counts give some
 * 27,000 rows): the numbers cross as typed arrays, one copy of their bytes,
 * where rows as objects or arrays are copied value by value. Row i is
 * day[i], hemisphere[i], observers[i]…; `sd` is NaN where a row has none
 * (DailyRow's null).
 */
export type DailyColumns = {
  length: number;
  day: string[];
  hemisphere: Hemisphere[];
  observers: Int32Array;
  sum: Float64Array;
  sumSquares: Float64Array;
  mean: Float64Array;
  sd: Float64Array;
};

function createDailyColumns(capacity: number): DailyColumns {
  return {
    length: 0,
    day: [],
    hemisphere: [],
    observers: new Int32Array(capacity),
    sum: new Float64Array(capacity),
    sumSquares: new Float64Array(capacity),
    mean: new Float64Array(capacity),
    sd: new Float64Array(capacity),
  };
}

/** The rows of `columns` as DailyRow objects, in the same order. */
export function dailyRowsOf(columns: DailyColumns): DailyRow[] {
  const rows: DailyRow[] = [];
  for (let i = 0; i < columns.length; i++) {
    const sd = columns.sd[i] as number;
    rows.push({
      day: columns.day[i]!,
      hemisphere: columns.hemisphere[i]!,
      observers: columns.observers[i] as number,
      sum: columns.sum[i] as number,
      sumSquares: columns.sumSquares[i] as number,
      mean: columns.mean[i] as number,
      sd: Number.isNaN(sd) ? null : sd,
    });
  }
  return rows;
}

export type MonthlyRow = {
  month: string;
  hemisphere: Hemisphere;
  days: number;
  sumOfDailyMeans: number;
  mean: number;
  smoothed: number | null;
};

export type YearlyRow = { year: number; hemisphere: Hemisphere; days: number; mean: number };

/** One observer's scaled value for a day; north/south are null without a split. */
export type ObserverDayValue = { total: number; north: number | null; south: number | null };

/** One accepted count with the k that scales it, as the incremental path reads it. */
export type ScaledCount = {
  observerKey: string;
  k: number;
  raw: number;
  northRaw: number | null;
  southRaw: number | null;
};

/**
 * An observer who sends two accepted counts for one day (two instruments, a
 * corrected re-count) is one observer that day: their scaled values are
 * averaged first, so the day's `observers` is a count of people and no one
 * weighs double. Order of first appearance is kept.
 */
export function combineObserverCounts(counts: ReadonlyArray<ScaledCount>): ObserverDayValue[] {
  const byObserver = new Map<
    string,
    { total: number; n: number; north: number; south: number; nSplit: number }
  >();
  for (const count of counts) {
    const entry = byObserver.get(count.observerKey) ?? { total: 0, n: 0, north: 0, south: 0, nSplit: 0 };
    entry.total += count.k * count.raw;
    entry.n += 1;
    if (count.northRaw !== null && count.southRaw !== null) {
      entry.north += count.k * count.northRaw;
      entry.south += count.k * count.southRaw;
      entry.nSplit += 1;
    }
    byObserver.set(count.observerKey, entry);
  }
  return [...byObserver.values()].map((e) => ({
    total: e.total / e.n,
    north: e.nSplit > 0 ? e.north / e.nSplit : null,
    south: e.nSplit > 0 ? e.south / e.nSplit : null,
  }));
}

/** A day's three rows (whole disk, north, south) from its observers' values; hemispheres without a split are left out. */
export function summariseDay({
  day,
  values,
}: {
  day: string;
  values: ReadonlyArray<ObserverDayValue>;
}): DailyRow[] {
  const sums = new DaySums();
  for (const value of values) sums.add(value.total, value.north, value.south);
  const columns = createDailyColumns(3);
  sums.appendColumns(day, columns);
  return dailyRowsOf(columns);
}

/**
 * A day's running sums for the whole disk and each hemisphere, in plain
 * numbers: both paths add their observers' values through it in the same
 * order, so their rows agree to the last bit, and the full recompute, which
 * does this for every observer of every day (a million times), makes no
 * object per value.
 */
class DaySums {
  n = 0;
  sum = 0;
  sumSquares = 0;
  /** Observers with a north/south split (the same for both hemispheres). */
  nSplit = 0;
  northSum = 0;
  northSquares = 0;
  southSum = 0;
  southSquares = 0;

  reset(): void {
    this.n = this.sum = this.sumSquares = 0;
    this.nSplit = this.northSum = this.northSquares = this.southSum = this.southSquares = 0;
  }

  add(total: number, north: number | null, south: number | null): void {
    this.n += 1;
    this.sum += total;
    this.sumSquares += total * total;
    if (north !== null && south !== null) {
      this.nSplit += 1;
      this.northSum += north;
      this.northSquares += north * north;
      this.southSum += south;
      this.southSquares += south * south;
    }
  }

  /** The day's rows (whole disk, north, south; none for a hemisphere without a split), into columns with room for three more. */
  appendColumns(day: string, columns: DailyColumns): void {
    pushDailyColumns(columns, day, "all", this.n, this.sum, this.sumSquares);
    pushDailyColumns(columns, day, "N", this.nSplit, this.northSum, this.northSquares);
    pushDailyColumns(columns, day, "S", this.nSplit, this.southSum, this.southSquares);
  }
}

function pushDailyColumns(
  columns: DailyColumns,
  day: string,
  hemisphere: Hemisphere,
  observers: number,
  sum: number,
  sumSquares: number,
): void {
  const summary = summariseSums({ n: observers, sum, sumSquares });
  if (!summary) return;
  const i = columns.length++;
  columns.day.push(day);
  columns.hemisphere.push(hemisphere);
  columns.observers[i] = observers;
  columns.sum[i] = sum;
  columns.sumSquares[i] = sumSquares;
  columns.mean[i] = summary.relativeNumber;
  columns.sd[i] = summary.sd ?? Number.NaN;
}

/** A month's row from its days' means (in day order); null when no day has data. */
export function summariseMonth({
  month,
  hemisphere,
  dailyMeans,
}: {
  month: string;
  hemisphere: Hemisphere;
  dailyMeans: ReadonlyArray<number>;
}): Omit<MonthlyRow, "smoothed"> | null {
  if (dailyMeans.length === 0) return null;
  let sum = 0;
  for (const mean of dailyMeans) sum += mean;
  return { month, hemisphere, days: dailyMeans.length, sumOfDailyMeans: sum, mean: sum / dailyMeans.length };
}

/**
 * The yearly mean over all days of the year with data (not the mean of the
 * monthly means, which would weigh a thin month like a full one), from the
 * year's monthly rows.
 */
export function summariseYear({
  year,
  hemisphere,
  months,
}: {
  year: number;
  hemisphere: Hemisphere;
  months: ReadonlyArray<{ days: number; sumOfDailyMeans: number }>;
}): YearlyRow | null {
  let days = 0;
  let sum = 0;
  for (const month of months) {
    days += month.days;
    sum += month.sumOfDailyMeans;
  }
  return days > 0 ? { year, hemisphere, days, mean: sum / days } : null;
}

/**
 * The 13-month smoothed value of one month from the monthly means around it
 * (smoothed13 of lib/counts/series.ts on the 13-month window), or null when
 * any of the 13 months has no mean.
 */
export function computeSmoothedAt({
  monthIndex,
  meanOfMonth,
}: {
  monthIndex: number;
  meanOfMonth: (monthIndex: number) => number | null | undefined;
}): number | null {
  const window: Array<number | null> = [];
  for (let offset = -6; offset <= 6; offset++) window.push(meanOfMonth(monthIndex + offset) ?? null);
  return smoothed13(window)[6] ?? null;
}

/**
 * Every daily, monthly and yearly row from all accepted counts at once.
 * `kOfRow[i]` is the k that scales row i; `observerOfUnit` tells which
 * observer each unit belongs to (for one value per observer per day).
 */
export function computeNetworkSeries({
  counts,
  kOfRow,
  observerOfUnit,
}: {
  counts: AcceptedCounts;
  kOfRow: Float64Array;
  observerOfUnit: Int32Array;
}): { daily: DailyRow[]; monthly: MonthlyRow[]; yearly: YearlyRow[] } {
  const daily: DailyRow[] = [];
  appendDailyRows({ counts, kOfRow, observerOfUnit, from: 0, to: counts.length, daily });
  return seriesFromDaily(daily);
}

/** The monthly and yearly rows that go with daily rows in day order. */
export function seriesFromDaily(daily: DailyRow[]): {
  daily: DailyRow[];
  monthly: MonthlyRow[];
  yearly: YearlyRow[];
} {
  const monthly = summariseMonthsFromDays(daily);
  return { daily, monthly, yearly: summariseYearsFromMonths(monthly) };
}

/**
 * The daily rows of rows [from, to) of `counts` (whole days: `from` and
 * `to` fall on day boundaries), appended to `daily` in day order. The full
 * recompute uses dailyColumnsOf, the same rows as columns.
 */
export function appendDailyRows({
  daily,
  ...slice
}: {
  counts: AcceptedCounts;
  kOfRow: Float64Array;
  observerOfUnit: Int32Array;
  from: number;
  to: number;
  daily: DailyRow[];
}): void {
  for (const row of dailyRowsOf(dailyColumnsOf(slice))) daily.push(row);
}

/**
 * The daily rows of rows [from, to) of `counts` (whole days: `from` and
 * `to` fall on day boundaries), in day order, as columns. `kOfRow[i]` is
 * the k that scales row i; `observerOfUnit` tells which observer each unit
 * belongs to (for one value per observer per day). The full recompute
 * calls it a slice of days at a time.
 */
export function dailyColumnsOf({
  counts,
  kOfRow,
  observerOfUnit,
  from: start,
  to: end,
}: {
  counts: AcceptedCounts;
  kOfRow: Float64Array;
  observerOfUnit: Int32Array;
  from: number;
  to: number;
}): DailyColumns {
  const { dayNumber: dayOf, unit: unitOf, raw: rawOf, northRaw: northOf, southRaw: southOf } = counts;
  // Splits are told apart by sign below, without a branch.
  if (NO_SPLIT >= 0) throw new Error("NO_SPLIT must be negative");
  let dayCount = 0;
  for (let i = start; i < end; i++) if (i === start || dayOf[i] !== dayOf[i - 1]) dayCount++;
  const columns = createDailyColumns(3 * dayCount);
  // Per-observer accumulators in typed arrays, reset through the list of
  // observers seen each day: a million updates of numbers in plain arrays
  // rather than of objects' fields, and no garbage.
  const observerCount = observerOfUnit.reduce((max, o) => Math.max(max, o + 1), 0);
  const total = new Float64Array(observerCount);
  const north = new Float64Array(observerCount);
  const south = new Float64Array(observerCount);
  const n = new Int32Array(observerCount);
  const nSplit = new Int32Array(observerCount);
  const seen = new Int32Array(observerCount);
  const sums = new DaySums();
  let from = start;
  while (from < end) {
    const dayNumber = dayOf[from] as number;
    let seenCount = 0;
    let to = from;
    for (; to < end && dayOf[to] === dayNumber; to++) {
      const observer = observerOfUnit[unitOf[to] as number] as number;
      if (n[observer] === 0) seen[seenCount++] = observer;
      const k = kOfRow[to] as number;
      total[observer] = (total[observer] as number) + k * (rawOf[to] as number);
      n[observer] = (n[observer] as number) + 1;
      // Without a branch: split is 1 when both hemispheres were counted,
      // else 0 (NO_SPLIT is negative), and then adds zeros.
      const northRaw = northOf[to] as number;
      const southRaw = southOf[to] as number;
      const split = ((northRaw | southRaw) >>> 31) ^ 1;
      north[observer] = (north[observer] as number) + k * (northRaw * split);
      south[observer] = (south[observer] as number) + k * (southRaw * split);
      nSplit[observer] = (nSplit[observer] as number) + split;
    }
    // Each observer's value of the day, in order of first appearance, as
    // combineObserverCounts gives it to summariseDay.
    sums.reset();
    for (let slot = 0; slot < seenCount; slot++) {
      const observer = seen[slot] as number;
      const splits = nSplit[observer] as number;
      sums.add(
        (total[observer] as number) / (n[observer] as number),
        splits > 0 ? (north[observer] as number) / splits : null,
        splits > 0 ? (south[observer] as number) / splits : null,
      );
      total[observer] = north[observer] = south[observer] = 0;
      n[observer] = nSplit[observer] = 0;
    }
    sums.appendColumns(formatDayNumber(dayNumber), columns);
    from = to;
  }
  return columns;
}

/** Monthly rows (with smoothed values) from daily rows in day order. */
export function summariseMonthsFromDays(daily: ReadonlyArray<DailyRow>): MonthlyRow[] {
  const meansByKey = new Map<string, number[]>();
  for (const row of daily) {
    const key = `${row.hemisphere}|${row.day.slice(0, 7)}`;
    const list = meansByKey.get(key);
    if (list) list.push(row.mean);
    else meansByKey.set(key, [row.mean]);
  }
  return summariseMonthsFromMeans(meansByKey);
}

/** The monthly and yearly rows that go with daily columns (slices in day order). */
export function seriesFromDailyColumns(slices: ReadonlyArray<DailyColumns>): {
  monthly: MonthlyRow[];
  yearly: YearlyRow[];
} {
  // Each day's rows share one day string, so its month is cut once per day,
  // and each hemisphere's list of the month is looked up once per month.
  const meansByKey = new Map<string, number[]>();
  const current = new Map<Hemisphere, { month: string; means: number[] }>();
  let lastDay = "";
  let month = "";
  for (const columns of slices) {
    for (let i = 0; i < columns.length; i++) {
      const day = columns.day[i]!;
      if (day !== lastDay) {
        lastDay = day;
        month = day.slice(0, 7);
      }
      const hemisphere = columns.hemisphere[i]!;
      let entry = current.get(hemisphere);
      if (entry?.month !== month) {
        const key = `${hemisphere}|${month}`;
        let means = meansByKey.get(key);
        if (!means) meansByKey.set(key, (means = []));
        entry = { month, means };
        current.set(hemisphere, entry);
      }
      entry.means.push(columns.mean[i] as number);
    }
  }
  const monthly = summariseMonthsFromMeans(meansByKey);
  return { monthly, yearly: summariseYearsFromMonths(monthly) };
}

/** Monthly rows from each month's daily means (in day order), keyed "hemisphere|YYYY-MM". */
function summariseMonthsFromMeans(meansByKey: ReadonlyMap<string, number[]>): MonthlyRow[] {
  const monthly: MonthlyRow[] = [];
  const meanByHemisphere = new Map<Hemisphere, Map<number, number>>();
  for (const [key, dailyMeans] of meansByKey) {
    const [hemisphere, month] = key.split("|") as [Hemisphere, string];
    const row = summariseMonth({ month, hemisphere, dailyMeans });
    if (!row) continue;
    monthly.push({ ...row, smoothed: null });
    const index = toMonthIndexOf(month);
    let byMonth = meanByHemisphere.get(hemisphere);
    if (!byMonth) meanByHemisphere.set(hemisphere, (byMonth = new Map()));
    byMonth.set(index, row.mean);
  }
  for (const row of monthly) {
    const byMonth = meanByHemisphere.get(row.hemisphere)!;
    const index = toMonthIndexOf(row.month);
    row.smoothed = computeSmoothedAt({ monthIndex: index, meanOfMonth: (m) => byMonth.get(m) });
  }
  const order: Record<Hemisphere, number> = { all: 0, N: 1, S: 2 };
  return monthly.sort((a, b) => order[a.hemisphere] - order[b.hemisphere] || a.month.localeCompare(b.month));
}

/** Yearly rows from monthly rows. */
export function summariseYearsFromMonths(monthly: ReadonlyArray<MonthlyRow>): YearlyRow[] {
  const byKey = new Map<string, MonthlyRow[]>();
  for (const row of monthly) {
    const key = `${row.hemisphere}|${row.month.slice(0, 4)}`;
    const list = byKey.get(key);
    if (list) list.push(row);
    else byKey.set(key, [row]);
  }
  const yearly: YearlyRow[] = [];
  for (const [key, months] of byKey) {
    const [hemisphere, year] = key.split("|") as [Hemisphere, string];
    const row = summariseYear({ year: Number(year), hemisphere, months });
    if (row) yearly.push(row);
  }
  return yearly;
}

/** Month index of a "YYYY-MM" month or "YYYY-MM-DD" day. */
export function toMonthIndexOf(text: string): number {
  return Number(text.slice(0, 4)) * 12 + Number(text.slice(5, 7)) - 1;
}
