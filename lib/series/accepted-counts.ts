/**
 * Accepted observations held column by column (typed arrays) for the full
 * recompute: a million counts as a handful of arrays instead of a million
 * objects. Rows are kept in day order, so every day, month, quarter and year
 * is one contiguous slice.
 */

import { countDaysFromCivil } from "@/lib/counts/series";

/** Stands for "this observation gave no north/south split". */
export const NO_SPLIT = -1;

export type AcceptedCounts = {
  length: number;
  /** Days since 1970-01-01 (UT), ascending. */
  dayNumber: Int32Array;
  /** Index of the observer–instrument pair ("unit") the count belongs to. */
  unit: Int32Array;
  /** 10g + s. */
  raw: Int32Array;
  /** 10gN + sN and 10gS + sS, or NO_SPLIT. */
  northRaw: Int32Array;
  southRaw: Int32Array;
};

export function createAcceptedCounts(capacity: number): AcceptedCounts {
  return {
    length: 0,
    dayNumber: new Int32Array(capacity),
    unit: new Int32Array(capacity),
    raw: new Int32Array(capacity),
    northRaw: new Int32Array(capacity),
    southRaw: new Int32Array(capacity),
  };
}

/** Makes room for `needed` counts in all, so appending them reallocates nothing. */
export function reserveCounts(counts: AcceptedCounts, needed: number): void {
  grow(counts, needed);
}

function grow(counts: AcceptedCounts, needed: number): void {
  if (needed <= counts.dayNumber.length) return;
  const capacity = Math.max(needed, Math.ceil(counts.dayNumber.length * 1.5) + 1024);
  for (const key of ["dayNumber", "unit", "raw", "northRaw", "southRaw"] as const) {
    const next = new Int32Array(capacity);
    next.set(counts[key].subarray(0, counts.length));
    counts[key] = next;
  }
}

export function appendCount(
  counts: AcceptedCounts,
  row: { dayNumber: number; unit: number; raw: number; northRaw?: number; southRaw?: number },
): void {
  grow(counts, counts.length + 1);
  const i = counts.length;
  if (i > 0 && row.dayNumber < (counts.dayNumber[i - 1] as number)) {
    throw new RangeError("Accepted counts must be appended in day order");
  }
  counts.dayNumber[i] = row.dayNumber;
  counts.unit[i] = row.unit;
  counts.raw[i] = row.raw;
  counts.northRaw[i] = row.northRaw ?? NO_SPLIT;
  counts.southRaw[i] = row.southRaw ?? NO_SPLIT;
  counts.length = i + 1;
}

/**
 * Reads one unit's counts packed as text by the database ("YYYY-MM-DD raw"
 * or "YYYY-MM-DD raw north south", entries separated by commas) and appends
 * them in the order given, which need not be day order: call
 * {@link sortCountsByDay} once every unit is in. The database packs each
 * unit's rows into one string because handing a million separate rows to
 * JavaScript costs far more than reading them (measured in
 * tests/bench/series.bench.ts); grouping by unit needs no join.
 */
export function appendPackedUnit({
  counts,
  unit,
  packed,
}: {
  counts: AcceptedCounts;
  unit: number;
  packed: string;
}): void {
  const length = packed.length;
  let p = 0;
  while (p < length) {
    const day = readPackedDay(packed, p);
    p += 10;
    let fieldCount = 0;
    let raw = 0;
    let north = NO_SPLIT;
    let south = NO_SPLIT;
    while (p < length && packed.charCodeAt(p) === 32) {
      p++;
      let value = 0;
      const start = p;
      for (; p < length; p++) {
        const digit = packed.charCodeAt(p) - 48;
        if (digit < 0 || digit > 9) break;
        value = value * 10 + digit;
      }
      if (p === start) throw new RangeError(`Malformed packed count near position ${start}`);
      if (fieldCount === 0) raw = value;
      else if (fieldCount === 1) north = value;
      else if (fieldCount === 2) south = value;
      fieldCount++;
    }
    if (fieldCount !== 1 && fieldCount !== 3)
      throw new RangeError(`Malformed packed count near position ${p}`);
    if (p < length) {
      if (packed.charCodeAt(p) !== 44) throw new RangeError(`Unexpected character at position ${p}`);
      p++;
    }
    grow(counts, counts.length + 1);
    const i = counts.length;
    counts.dayNumber[i] = day;
    counts.unit[i] = unit;
    counts.raw[i] = raw;
    counts.northRaw[i] = north;
    counts.southRaw[i] = south;
    counts.length = i + 1;
  }
}

/** "YYYY-MM-DD" at `at` as a day number (days since 1970-01-01), without slicing the string. */
function readPackedDay(packed: string, at: number): number {
  if (packed.charCodeAt(at + 4) !== 45 || packed.charCodeAt(at + 7) !== 45)
    throw new RangeError(`Expected a day as YYYY-MM-DD at position ${at}`);
  let year = 0;
  for (let i = at; i < at + 4; i++) year = year * 10 + digitAt(packed, i);
  const month = digitAt(packed, at + 5) * 10 + digitAt(packed, at + 6);
  const dayOfMonth = digitAt(packed, at + 8) * 10 + digitAt(packed, at + 9);
  if (month < 1 || month > 12 || dayOfMonth < 1 || dayOfMonth > 31)
    throw new RangeError(`Expected a real calendar day at position ${at}`);
  return countDaysFromCivil(year, month, dayOfMonth);
}

function digitAt(text: string, at: number): number {
  const digit = text.charCodeAt(at) - 48;
  if (digit < 0 || digit > 9) throw new RangeError(`Expected a digit at position ${at}`);
  return digit;
}

/**
 * The same counts in day order (a stable counting sort: within a day, the
 * order they were appended in). Linear in the number of counts plus the
 * span of days, which a million counts over decades keeps small.
 */
export function sortCountsByDay(counts: AcceptedCounts): AcceptedCounts {
  const n = counts.length;
  const sorted = createAcceptedCounts(n);
  sorted.length = n;
  if (n === 0) return sorted;
  let first = Number.POSITIVE_INFINITY;
  let last = Number.NEGATIVE_INFINITY;
  for (let i = 0; i < n; i++) {
    const day = counts.dayNumber[i] as number;
    if (day < first) first = day;
    if (day > last) last = day;
  }
  const start = new Int32Array(last - first + 2);
  for (let i = 0; i < n; i++) {
    const slot = (counts.dayNumber[i] as number) - first + 1;
    start[slot] = (start[slot] as number) + 1;
  }
  for (let d = 1; d < start.length; d++) start[d] = (start[d] as number) + (start[d - 1] as number);
  for (let i = 0; i < n; i++) {
    const slot = (counts.dayNumber[i] as number) - first;
    const at = start[slot] as number;
    start[slot] = at + 1;
    sorted.dayNumber[at] = counts.dayNumber[i] as number;
    sorted.unit[at] = counts.unit[i] as number;
    sorted.raw[at] = counts.raw[i] as number;
    sorted.northRaw[at] = counts.northRaw[i] as number;
    sorted.southRaw[at] = counts.southRaw[i] as number;
  }
  return sorted;
}

/** Contiguous slices [from, to) of rows sharing a key (day, period...), in row order. */
export function sliceByKey({
  counts,
  keyOf,
}: {
  counts: AcceptedCounts;
  keyOf: (dayNumber: number) => number;
}): Array<{ key: number; from: number; to: number }> {
  const slices: Array<{ key: number; from: number; to: number }> = [];
  let lastDay = Number.NaN;
  let lastKey = Number.NaN;
  for (let i = 0; i < counts.length; i++) {
    const day = counts.dayNumber[i] as number;
    if (day === lastDay) continue;
    lastDay = day;
    const key = keyOf(day);
    if (key !== lastKey) {
      const previous = slices[slices.length - 1];
      if (previous) previous.to = i;
      slices.push({ key, from: i, to: counts.length });
      lastKey = key;
    }
  }
  return slices;
}
