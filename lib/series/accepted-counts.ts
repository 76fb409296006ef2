/**
 * Accepted observations held column by column (typed arrays) for the full
 * recompute: a million counts as a handful of arrays instead of a million
 * objects. Rows are kept in day order, so every day, month, quarter and year
 * is one contiguous slice.
 */

import { PACKED_DAY_OFFSET, PACKED_WIDTH } from "./packed-count";

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
 * One unit's counts as the database packs them (lib/series/packed-count.ts):
 * `count` fixed-width values, concatenated with no separator, starting at
 * character `from` of `packed`. Several units may share one string.
 */
export type PackedUnit = {
  unit: number;
  packed: string;
  from: number;
  count: number;
};

/**
 * Every unit's packed counts as one set of arrays in day order (within a
 * day, in the order the units are given). A unit running past the end of
 * its string, or a character other than a digit, is refused; the caller
 * checks that the units cover each string exactly, so a row that could not
 * be packed is never silently lost. The database packs each unit's rows into one string because
 * handing a million separate rows to JavaScript costs far more than reading
 * them (measured in tests/bench/series.bench.ts).
 *
 * Two passes over the text, no intermediate copy: the first reads every
 * day and counts the rows per day, the second puts each row straight into
 * its place (a counting sort, linear in the rows plus the span of days).
 */
export function countsFromPackedUnits(units: readonly PackedUnit[]): AcceptedCounts {
  let total = 0;
  for (const { packed, from, count } of units) {
    if (!(from >= 0 && count >= 0 && from + count * PACKED_WIDTH <= packed.length)) {
      throw new RangeError(
        `Expected ${count} packed counts (${count * PACKED_WIDTH} digits) from character ${from} of ${packed.length}`,
      );
    }
    total += count;
  }
  const counts = createAcceptedCounts(total);
  counts.length = total;
  if (total === 0) return counts;

  // Every character a digit, checked once per string (a regular expression
  // runs far faster than a check per character in the loops below).
  const checkedStrings = new Set<string>();
  for (const { packed } of units) {
    if (checkedStrings.has(packed)) continue;
    if (!ONLY_DIGITS.test(packed)) throw new RangeError("Packed counts must be digits only");
    checkedStrings.add(packed);
  }

  const days = new Int32Array(total);
  let first = Number.POSITIVE_INFINITY;
  let last = Number.NEGATIVE_INFINITY;
  let row = 0;
  for (const { packed, from, count } of units) {
    const end = from + count * PACKED_WIDTH;
    for (let p = from; p < end; p += PACKED_WIDTH) {
      const day = digits6(packed, p) - PACKED_DAY_OFFSET;
      days[row++] = day;
      if (day < first) first = day;
      if (day > last) last = day;
    }
  }
  // next[d]: where the next row of day first + d goes.
  const next = new Int32Array(last - first + 2);
  for (let i = 0; i < total; i++) {
    const slot = (days[i] as number) - first + 1;
    next[slot] = (next[slot] as number) + 1;
  }
  for (let d = 1; d < next.length; d++) next[d] = (next[d] as number) + (next[d - 1] as number);

  row = 0;
  for (const { unit, packed, from, count } of units) {
    const end = from + count * PACKED_WIDTH;
    for (let p = from; p < end; p += PACKED_WIDTH) {
      const day = days[row++] as number;
      const slot = day - first;
      const at = next[slot] as number;
      next[slot] = at + 1;
      counts.dayNumber[at] = day;
      counts.unit[at] = unit;
      counts.raw[at] = digits4(packed, p + 6);
      // 0 stands for "no split", so minus one gives NO_SPLIT.
      counts.northRaw[at] = digits4(packed, p + 10) - 1;
      counts.southRaw[at] = digits4(packed, p + 14) - 1;
    }
  }
  return counts;
}

const ONLY_DIGITS = /^[0-9]*$/;
const ZEROS_4 = 48 * 1111;

/** The number written by the four digits at `at` (checked to be digits beforehand). */
function digits4(text: string, at: number): number {
  return (
    text.charCodeAt(at) * 1000 +
    text.charCodeAt(at + 1) * 100 +
    text.charCodeAt(at + 2) * 10 +
    text.charCodeAt(at + 3) -
    ZEROS_4
  );
}

/** The number written by the six digits at `at` (checked to be digits beforehand). */
function digits6(text: string, at: number): number {
  return digits4(text, at) * 100 + text.charCodeAt(at + 4) * 10 + text.charCodeAt(at + 5) - 48 * 11;
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
