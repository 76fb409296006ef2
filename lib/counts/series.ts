/**
 * The network series: daily index, monthly and yearly means, and the
 * 13-month smoothed mean. Days are handled as integer day numbers (days since
 * 1970-01-01, UT calendar) so that grouping uses typed arrays instead of
 * string keys; a day may be given either as "YYYY-MM-DD" or as that number.
 *
 * Every aggregate is built from running sums (n, Σx, Σx²) so a database layer
 * can store the sums per day and per month and update one day in O(1) when an
 * observation is accepted, edited or rejected (see {@link accumulateDay},
 * {@link withdrawFromDay}, {@link finaliseDay}, {@link addToSums}).
 */

// ---------------------------------------------------------------------------
// Day numbers and month indices
// ---------------------------------------------------------------------------

/** Day numbers of 0000-01-01 and 9999-12-31: the range "YYYY-MM-DD" can express. */
export const FIRST_DAY_NUMBER = -719_528;
export const LAST_DAY_NUMBER = 2_932_896;

/** Days since 1970-01-01 for a "YYYY-MM-DD" string, or the number itself if already a day number. */
export function toDayNumber(day: string | number): number {
  if (typeof day === "number") {
    // The range check also keeps day numbers safe in the Int32Arrays used for grouping.
    if (!Number.isInteger(day) || day < FIRST_DAY_NUMBER || day > LAST_DAY_NUMBER) {
      throw new RangeError(`A day number must be a whole number for a day in years 0000–9999, got ${day}`);
    }
    return day;
  }
  // Hand-parsed: this runs once per observation in bulk paths, where a
  // regular expression or Date parsing costs several times more.
  if (day.length !== 10 || day.charCodeAt(4) !== 45 || day.charCodeAt(7) !== 45) {
    throw new RangeError(`Expected a day as YYYY-MM-DD, got "${day}"`);
  }
  const year = readDigits(day, 0, 4);
  const month = readDigits(day, 5, 7);
  const dayOfMonth = readDigits(day, 8, 10);
  if (year < 0 || month < 1 || month > 12 || dayOfMonth < 1 || dayOfMonth > countDaysInMonth(year, month)) {
    throw new RangeError(`Expected a real calendar day as YYYY-MM-DD, got "${day}"`);
  }
  return countDaysFromCivil(year, month, dayOfMonth);
}

function readDigits(text: string, start: number, end: number): number {
  let value = 0;
  for (let i = start; i < end; i++) {
    const digit = text.charCodeAt(i) - 48;
    if (digit < 0 || digit > 9) return -1;
    value = value * 10 + digit;
  }
  return value;
}

function countDaysInMonth(year: number, month: number): number {
  if (month === 2) return (year % 4 === 0 && year % 100 !== 0) || year % 400 === 0 ? 29 : 28;
  return month === 4 || month === 6 || month === 9 || month === 11 ? 30 : 31;
}

/**
 * Days since 1970-01-01 for a proleptic Gregorian date, by whole 400-year
 * eras (H. Hinnant's "days_from_civil"): exact for any year and free of
 * time-zone surprises. No range checks: callers validate.
 */
export function countDaysFromCivil(year: number, month: number, dayOfMonth: number): number {
  const y = month <= 2 ? year - 1 : year;
  const era = Math.floor(y / 400);
  const yearOfEra = y - era * 400;
  const dayOfYear = Math.floor((153 * (month + (month > 2 ? -3 : 9)) + 2) / 5) + dayOfMonth - 1;
  const dayOfEra = yearOfEra * 365 + Math.floor(yearOfEra / 4) - Math.floor(yearOfEra / 100) + dayOfYear;
  return era * 146097 + dayOfEra - 719468;
}

/** Calendar date of a day number. */
export function splitDayNumber(dayNumber: number): { year: number; month: number; dayOfMonth: number } {
  const z = dayNumber + 719468;
  const era = Math.floor(z / 146097);
  const dayOfEra = z - era * 146097;
  const yearOfEra = Math.floor(
    (dayOfEra - Math.floor(dayOfEra / 1460) + Math.floor(dayOfEra / 36524) - Math.floor(dayOfEra / 146096)) /
      365,
  );
  const dayOfYear = dayOfEra - (365 * yearOfEra + Math.floor(yearOfEra / 4) - Math.floor(yearOfEra / 100));
  const mp = Math.floor((5 * dayOfYear + 2) / 153);
  const dayOfMonth = dayOfYear - Math.floor((153 * mp + 2) / 5) + 1;
  const month = mp < 10 ? mp + 3 : mp - 9;
  return { year: yearOfEra + era * 400 + (month <= 2 ? 1 : 0), month, dayOfMonth };
}

/** "YYYY-MM-DD" for a day number. */
export function formatDayNumber(dayNumber: number): string {
  const { year, month, dayOfMonth } = splitDayNumber(dayNumber);
  return `${String(year).padStart(4, "0")}-${String(month).padStart(2, "0")}-${String(dayOfMonth).padStart(2, "0")}`;
}

/** Months counted from year 0: year·12 + (month − 1). Consecutive months differ by 1, which makes dense arrays trivial. */
export function toMonthIndex({ year, month }: { year: number; month: number }): number {
  return year * 12 + (month - 1);
}

export function splitMonthIndex(monthIndex: number): { year: number; month: number } {
  const year = Math.floor(monthIndex / 12);
  return { year, month: monthIndex - year * 12 + 1 };
}

/**
 * Maps day numbers to compact slots 0..slotCount−1 for typed-array
 * accumulation. A dense offset from the first day is used when the span is
 * reasonable (25 years is only ~9,100 slots); a sparse Map otherwise, so a
 * stray far-off date cannot make us allocate gigabytes.
 */
export function assignDaySlots(
  dayNumbers: Int32Array | Float64Array,
  /** Where to put the slots (every element is written); a new array by default. */
  slots: Int32Array = new Int32Array(dayNumbers.length),
): {
  slots: Int32Array;
  slotCount: number;
  dayNumberOfSlot: Float64Array;
} {
  const count = dayNumbers.length;
  if (slots.length !== count) throw new RangeError(`${count} days need ${count} slots, not ${slots.length}`);
  let min = Number.POSITIVE_INFINITY;
  let max = Number.NEGATIVE_INFINITY;
  for (let i = 0; i < count; i++) {
    const d = dayNumbers[i] as number;
    if (d < min) min = d;
    if (d > max) max = d;
  }
  if (count === 0) return { slots, slotCount: 0, dayNumberOfSlot: new Float64Array(0) };
  const span = max - min + 1;
  if (span <= Math.max(4 * count, 1 << 16)) {
    for (let i = 0; i < count; i++) slots[i] = (dayNumbers[i] as number) - min;
    const dayNumberOfSlot = new Float64Array(span);
    for (let s = 0; s < span; s++) dayNumberOfSlot[s] = min + s;
    return { slots, slotCount: span, dayNumberOfSlot };
  }
  const slotByDay = new Map<number, number>();
  const days: number[] = [];
  for (let i = 0; i < count; i++) {
    const d = dayNumbers[i] as number;
    let slot = slotByDay.get(d);
    if (slot === undefined) {
      slot = days.length;
      slotByDay.set(d, slot);
      days.push(d);
    }
    slots[i] = slot;
  }
  return { slots, slotCount: days.length, dayNumberOfSlot: Float64Array.from(days) };
}

// ---------------------------------------------------------------------------
// Running sums
// ---------------------------------------------------------------------------

/** n, Σx and Σx² of a set of values: enough for mean and sample SD, and updatable in O(1). */
export type RunningSums = { n: number; sum: number; sumSquares: number };

export const EMPTY_SUMS: RunningSums = Object.freeze({ n: 0, sum: 0, sumSquares: 0 });

export function addToSums({ sums, value }: { sums: RunningSums; value: number }): RunningSums {
  return { n: sums.n + 1, sum: sums.sum + value, sumSquares: sums.sumSquares + value * value };
}

/** Removes a value that was added earlier (an edited or rejected observation). */
export function removeFromSums({ sums, value }: { sums: RunningSums; value: number }): RunningSums {
  if (sums.n <= 0) throw new RangeError("Cannot remove a value from empty sums");
  // Reset exactly at zero so rounding residue never leaves a phantom mean.
  if (sums.n === 1) return { n: 0, sum: 0, sumSquares: 0 };
  return { n: sums.n - 1, sum: sums.sum - value, sumSquares: sums.sumSquares - value * value };
}

export type IndexValue = {
  /** Mean of the values (a relative number). */
  relativeNumber: number;
  /** Number of values: observers for a day, days for a month or year. */
  count: number;
  /** Sample standard deviation (n − 1); null with fewer than two values. */
  sd: number | null;
};

/**
 * Mean and sample SD from running sums. The one-pass formula loses precision
 * only when the spread is below about 1e-7 of the mean, far under any real
 * scatter between observers, and it is what makes O(1) updates possible.
 */
export function summariseSums(sums: RunningSums): IndexValue | null {
  return summariseRaw(sums.n, sums.sum, sums.sumSquares);
}

function summariseRaw(n: number, sum: number, sumSquares: number): IndexValue | null {
  if (n <= 0) return null;
  const mean = sum / n;
  if (n < 2) return { relativeNumber: mean, count: n, sd: null };
  const variance = Math.max(0, (sumSquares - sum * mean) / (n - 1));
  return { relativeNumber: mean, count: n, sd: Math.sqrt(variance) };
}

// ---------------------------------------------------------------------------
// Daily index
// ---------------------------------------------------------------------------

/** One accepted observation with its observer's k. Hemisphere counts are used only when all four are present. */
export type ScaledObservation = {
  day: string | number;
  k: number;
  groups: number;
  spots: number;
  northGroups?: number | null;
  northSpots?: number | null;
  southGroups?: number | null;
  southSpots?: number | null;
};

export type DaySums = { total: RunningSums; north: RunningSums; south: RunningSums };

export const EMPTY_DAY_SUMS: DaySums = Object.freeze({
  total: EMPTY_SUMS,
  north: EMPTY_SUMS,
  south: EMPTY_SUMS,
});

export type DailyIndexEntry = IndexValue & {
  dayNumber: number;
  day: string;
  /** Hemispheric index from the observations that gave the split; null if none did. */
  north: IndexValue | null;
  south: IndexValue | null;
};

/** Returns k(10g+s) and, when the split is given, the two hemispheric values (NaN when absent). */
function scaleObservation(observation: ScaledObservation): { total: number; north: number; south: number } {
  const { k, groups, spots, northGroups, northSpots, southGroups, southSpots } = observation;
  const total = k * (10 * groups + spots);
  if (!(k > 0) || !Number.isFinite(total) || !(groups >= 0) || !(spots >= 0)) {
    throw new RangeError(`Invalid scaled observation (k=${k}, g=${groups}, s=${spots})`);
  }
  if (northGroups == null || northSpots == null || southGroups == null || southSpots == null) {
    return { total, north: Number.NaN, south: Number.NaN };
  }
  return { total, north: k * (10 * northGroups + northSpots), south: k * (10 * southGroups + southSpots) };
}

/** Adds one observation to a day's stored sums (returns new sums; the input is not modified). */
export function accumulateDay({
  sums,
  observation,
}: {
  sums: DaySums;
  observation: ScaledObservation;
}): DaySums {
  const { total, north, south } = scaleObservation(observation);
  const hasSplit = !Number.isNaN(north);
  return {
    total: addToSums({ sums: sums.total, value: total }),
    north: hasSplit ? addToSums({ sums: sums.north, value: north }) : sums.north,
    south: hasSplit ? addToSums({ sums: sums.south, value: south }) : sums.south,
  };
}

/** Takes back an observation added with {@link accumulateDay} (pass the same k and counts it was added with). */
export function withdrawFromDay({
  sums,
  observation,
}: {
  sums: DaySums;
  observation: ScaledObservation;
}): DaySums {
  const { total, north, south } = scaleObservation(observation);
  const hasSplit = !Number.isNaN(north);
  return {
    total: removeFromSums({ sums: sums.total, value: total }),
    north: hasSplit ? removeFromSums({ sums: sums.north, value: north }) : sums.north,
    south: hasSplit ? removeFromSums({ sums: sums.south, value: south }) : sums.south,
  };
}

/** The published daily value from a day's sums; null when the day has no observations. */
export function finaliseDay({ day, sums }: { day: string | number; sums: DaySums }): DailyIndexEntry | null {
  const total = summariseSums(sums.total);
  if (total === null) return null;
  const dayNumber = toDayNumber(day);
  return {
    ...total,
    dayNumber,
    day: formatDayNumber(dayNumber),
    north: summariseSums(sums.north),
    south: summariseSums(sums.south),
  };
}

/**
 * Network daily index: per day, the mean of k_i(10g_i + s_i) over the day's
 * observations, their count and sample SD, and the same for each hemisphere
 * over the observations that carry the north/south split. Pass accepted
 * observations only, one per observer per day (so `count` is the number of
 * observers); rejecting doubtful counts is the caller's job.
 * Sorted by day. Gives the same numbers as folding the observations through
 * {@link accumulateDay} and {@link finaliseDay} in input order.
 */
export function computeDailyIndex(observations: ReadonlyArray<ScaledObservation>): DailyIndexEntry[] {
  const count = observations.length;
  const dayNumbers = new Int32Array(count);
  for (let i = 0; i < count; i++) dayNumbers[i] = toDayNumber((observations[i] as ScaledObservation).day);
  const { slots, slotCount, dayNumberOfSlot } = assignDaySlots(dayNumbers);

  // One flat array with nine numbers per day (n, Σx, Σx² for total, north,
  // south) instead of an object per day: no allocation in the loop over a
  // million observations.
  const sums = new Float64Array(slotCount * 9);
  for (let i = 0; i < count; i++) {
    const observation = observations[i] as ScaledObservation;
    const { total, north, south } = scaleObservation(observation);
    const base = (slots[i] as number) * 9;
    sums[base] = (sums[base] as number) + 1;
    sums[base + 1] = (sums[base + 1] as number) + total;
    sums[base + 2] = (sums[base + 2] as number) + total * total;
    if (!Number.isNaN(north)) {
      sums[base + 3] = (sums[base + 3] as number) + 1;
      sums[base + 4] = (sums[base + 4] as number) + north;
      sums[base + 5] = (sums[base + 5] as number) + north * north;
      sums[base + 6] = (sums[base + 6] as number) + 1;
      sums[base + 7] = (sums[base + 7] as number) + south;
      sums[base + 8] = (sums[base + 8] as number) + south * south;
    }
  }

  const order = Array.from({ length: slotCount }, (_, s) => s).sort(
    (a, b) => (dayNumberOfSlot[a] as number) - (dayNumberOfSlot[b] as number),
  );
  const entries: DailyIndexEntry[] = [];
  for (const slot of order) {
    const base = slot * 9;
    const total = summariseRaw(sums[base] as number, sums[base + 1] as number, sums[base + 2] as number);
    if (total === null) continue;
    const dayNumber = dayNumberOfSlot[slot] as number;
    entries.push({
      ...total,
      dayNumber,
      day: formatDayNumber(dayNumber),
      north: summariseRaw(sums[base + 3] as number, sums[base + 4] as number, sums[base + 5] as number),
      south: summariseRaw(sums[base + 6] as number, sums[base + 7] as number, sums[base + 8] as number),
    });
  }
  return entries;
}

// ---------------------------------------------------------------------------
// Monthly and yearly means
// ---------------------------------------------------------------------------

/** A mean over days with data. `count` is the number of days (not observations) behind it. */
export type PeriodMean = {
  relativeNumber: number;
  count: number;
  north: { relativeNumber: number; count: number } | null;
  south: { relativeNumber: number; count: number } | null;
};

export type MonthlyMean = PeriodMean & { monthIndex: number; year: number; month: number };
export type YearlyMean = PeriodMean & { year: number };

type PeriodSums = { total: RunningSums; north: RunningSums; south: RunningSums };

function averageDays<Key extends number>(
  daily: ReadonlyArray<DailyIndexEntry>,
  keyOf: (dayNumber: number) => Key,
): Array<[Key, PeriodMean]> {
  const byKey = new Map<Key, PeriodSums>();
  for (const entry of daily) {
    const key = keyOf(entry.dayNumber);
    const sums = byKey.get(key) ?? EMPTY_DAY_SUMS;
    byKey.set(key, {
      total: addToSums({ sums: sums.total, value: entry.relativeNumber }),
      north: entry.north ? addToSums({ sums: sums.north, value: entry.north.relativeNumber }) : sums.north,
      south: entry.south ? addToSums({ sums: sums.south, value: entry.south.relativeNumber }) : sums.south,
    });
  }
  const toMean = (s: RunningSums) => (s.n > 0 ? { relativeNumber: s.sum / s.n, count: s.n } : null);
  return [...byKey.entries()]
    .sort((a, b) => a[0] - b[0])
    .map(([key, sums]) => [
      key,
      {
        relativeNumber: sums.total.sum / sums.total.n,
        count: sums.total.n,
        north: toMean(sums.north),
        south: toMean(sums.south),
      },
    ]);
}

/**
 * Monthly means of the daily index: the plain mean over the days of the
 * month that have a value (days without observations are not zeros), with
 * the number of such days. To update one month incrementally, keep its
 * {@link RunningSums} of daily values and swap the changed day's old value
 * for its new one with {@link removeFromSums} / {@link addToSums}.
 */
export function computeMonthlyMeans(daily: ReadonlyArray<DailyIndexEntry>): MonthlyMean[] {
  return averageDays(daily, (dayNumber) => toMonthIndex(splitDayNumber(dayNumber))).map(
    ([monthIndex, mean]) => ({
      ...mean,
      monthIndex,
      ...splitMonthIndex(monthIndex),
    }),
  );
}

/** Yearly means: the mean over all days of the year that have a value (not the mean of the monthly means, which would weight thin months as heavily as full ones). */
export function computeYearlyMeans(daily: ReadonlyArray<DailyIndexEntry>): YearlyMean[] {
  return averageDays(daily, (dayNumber) => splitDayNumber(dayNumber).year).map(([year, mean]) => ({
    ...mean,
    year,
  }));
}

/**
 * Lays monthly means out as a gap-free array (one slot per calendar month,
 * null where a month has no value or fewer than `minDayCount` days), which is
 * what {@link smoothed13} needs. The range defaults to the first and last
 * months present; pass it explicitly to align several series.
 */
export function toDenseMonthlySeries({
  monthly,
  hemisphere = "total",
  startMonthIndex,
  endMonthIndex,
  minDayCount = 1,
}: {
  monthly: ReadonlyArray<MonthlyMean>;
  hemisphere?: "total" | "north" | "south";
  startMonthIndex?: number;
  endMonthIndex?: number;
  minDayCount?: number;
}): { startMonthIndex: number; values: Array<number | null> } {
  const first =
    startMonthIndex ?? monthly.reduce((min, m) => Math.min(min, m.monthIndex), Number.POSITIVE_INFINITY);
  const last =
    endMonthIndex ?? monthly.reduce((max, m) => Math.max(max, m.monthIndex), Number.NEGATIVE_INFINITY);
  if (!Number.isFinite(first) || !Number.isFinite(last) || last < first)
    return { startMonthIndex: first, values: [] };
  const values: Array<number | null> = new Array<number | null>(last - first + 1).fill(null);
  for (const month of monthly) {
    const offset = month.monthIndex - first;
    if (offset < 0 || offset >= values.length) continue;
    const value = hemisphere === "total" ? month : month[hemisphere];
    if (value !== null && value.count >= minDayCount) values[offset] = value.relativeNumber;
  }
  return { startMonthIndex: first, values };
}

// ---------------------------------------------------------------------------
// 13-month smoothed mean
// ---------------------------------------------------------------------------

/**
 * The 13-month tapered running mean
 * Rs(n) = [R(n−6) + 2(R(n−5) + … + R(n+5)) + R(n+6)] / 24
 * over consecutive monthly means. The taper gives the end months half
 * weight so the window spans exactly a year. A value is produced only when
 * all 13 months exist: filling a gap would invent data, so any missing month
 * (null or non-finite) blanks every smoothed value whose window touches it;
 * the first and last six months are always null.
 */
export function smoothed13(monthlyMeans: ReadonlyArray<number | null>): Array<number | null> {
  const n = monthlyMeans.length;
  const result: Array<number | null> = new Array<number | null>(n).fill(null);
  for (let centre = 6; centre < n - 6; centre++) {
    let weighted = 0;
    let complete = true;
    for (let offset = -6; offset <= 6; offset++) {
      const value = monthlyMeans[centre + offset];
      if (value == null || !Number.isFinite(value)) {
        complete = false;
        break;
      }
      weighted += offset === -6 || offset === 6 ? value : 2 * value;
    }
    if (complete) result[centre] = weighted / 24;
  }
  return result;
}
