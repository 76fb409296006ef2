/**
 * Accepted observations held column by column (typed arrays) for the full
 * recompute: a million counts as a handful of arrays instead of a million
 * objects. Rows are kept in day order, so every day, month, quarter and year
 * is one contiguous slice.
 */

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
 * Reads one day's counts packed as text by the database ("unit raw" or
 * "unit raw north south", entries separated by commas) and appends them.
 * The database packs a day's rows into one string because handing a million
 * separate rows to JavaScript costs far more than the scan itself (measured
 * in tests/bench/series.bench.ts). `unitOfKey` maps the packed unit key (the
 * instrument's row number) to a unit index; counts of unknown keys throw.
 */
export function appendPackedDay({
  counts,
  dayNumber,
  packed,
  unitOfKey,
}: {
  counts: AcceptedCounts;
  dayNumber: number;
  packed: string;
  unitOfKey: (key: number) => number | undefined;
}): void {
  if (counts.length > 0 && dayNumber < (counts.dayNumber[counts.length - 1] as number)) {
    throw new RangeError("Accepted counts must be appended in day order");
  }
  const fields = [0, 0, 0, 0];
  let fieldCount = 0;
  let value = 0;
  let inNumber = false;
  const flush = () => {
    if (inNumber) {
      if (fieldCount < 4) fields[fieldCount] = value;
      fieldCount++;
    }
    value = 0;
    inNumber = false;
  };
  const finishEntry = () => {
    flush();
    if (fieldCount === 0) return;
    if (fieldCount !== 2 && fieldCount !== 4)
      throw new RangeError(`Malformed packed count for day ${dayNumber}`);
    const unit = unitOfKey(fields[0] as number);
    if (unit === undefined) throw new RangeError(`Unknown unit key ${fields[0]} for day ${dayNumber}`);
    grow(counts, counts.length + 1);
    const i = counts.length;
    counts.dayNumber[i] = dayNumber;
    counts.unit[i] = unit;
    counts.raw[i] = fields[1] as number;
    counts.northRaw[i] = fieldCount === 4 ? (fields[2] as number) : NO_SPLIT;
    counts.southRaw[i] = fieldCount === 4 ? (fields[3] as number) : NO_SPLIT;
    counts.length = i + 1;
    fieldCount = 0;
  };
  for (let p = 0; p < packed.length; p++) {
    const code = packed.charCodeAt(p);
    if (code >= 48 && code <= 57) {
      value = value * 10 + (code - 48);
      inNumber = true;
    } else if (code === 32) {
      flush();
    } else if (code === 44) {
      finishEntry();
    } else {
      throw new RangeError(`Unexpected character in packed counts for day ${dayNumber}`);
    }
  }
  finishEntry();
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
