/**
 * Accepted observations held column by column (typed arrays) for the full
 * recompute: a million counts as a handful of arrays instead of a million
 * objects. Rows are kept in day order, so every day, month, quarter and year
 * is one contiguous slice.
 */

import type { CountPack } from "./count-packs";

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

/**
 * Empty arrays for `capacity` counts; `shared: true` puts them in shared
 * memory, so a worker thread can read them without a copy
 * (lib/series/k-fit-helper.ts).
 */
export function createAcceptedCounts(capacity: number, { shared = false } = {}): AcceptedCounts {
  const column = () =>
    shared ? new Int32Array(new SharedArrayBuffer(4 * capacity)) : new Int32Array(capacity);
  return {
    length: 0,
    dayNumber: column(),
    unit: column(),
    raw: column(),
    northRaw: column(),
    southRaw: column(),
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
 * Every unit's counts (one count pack each, lib/series/count-packs.ts) as
 * one set of arrays in day order; within a day, in the order the units are
 * given. A counting sort: one pass counts the rows of each day, a second
 * puts each row straight into its place (linear in the rows plus the span
 * of days, no intermediate copy). The arrays are in shared memory, for the
 * k-fit helper thread.
 */
export function countsFromPacks(units: ReadonlyArray<{ unit: number; pack: CountPack }>): AcceptedCounts {
  let total = 0;
  let first = Number.POSITIVE_INFINITY;
  let last = Number.NEGATIVE_INFINITY;
  for (const { pack } of units) {
    total += pack.count;
    const { days } = pack;
    for (let i = 0; i < pack.count; i++) {
      const day = days[i] as number;
      if (day < first) first = day;
      if (day > last) last = day;
    }
  }
  const counts = createAcceptedCounts(total, { shared: true });
  counts.length = total;
  if (total === 0) return counts;

  // next[d]: where the next row of day first + d goes.
  const next = new Int32Array(last - first + 2);
  for (const { pack } of units) {
    const { days } = pack;
    for (let i = 0; i < pack.count; i++) {
      const slot = (days[i] as number) - first + 1;
      next[slot] = (next[slot] as number) + 1;
    }
  }
  for (let d = 1; d < next.length; d++) next[d] = (next[d] as number) + (next[d - 1] as number);

  const { dayNumber, unit: unitOf, raw, northRaw, southRaw } = counts;
  for (const { unit, pack } of units) {
    const { days, values } = pack;
    for (let i = 0; i < pack.count; i++) {
      const day = days[i] as number;
      const slot = day - first;
      const at = next[slot] as number;
      next[slot] = at + 1;
      dayNumber[at] = day;
      unitOf[at] = unit;
      raw[at] = values[3 * i] as number;
      // 0 stands for "no split", so minus one gives NO_SPLIT.
      northRaw[at] = (values[3 * i + 1] as number) - 1;
      southRaw[at] = (values[3 * i + 2] as number) - 1;
    }
  }
  return counts;
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
