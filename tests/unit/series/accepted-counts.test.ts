import { describe, expect, it } from "vitest";

import {
  appendCount,
  appendPackedDay,
  createAcceptedCounts,
  NO_SPLIT,
  sliceByKey,
} from "@/lib/series/accepted-counts";

const unitOfKey = (key: number) => (key >= 100 ? key - 100 : undefined);

describe("appendPackedDay", () => {
  it("reads plain and split counts and grows the arrays as needed", () => {
    const counts = createAcceptedCounts(1);
    appendPackedDay({ counts, dayNumber: 19_000, packed: "100 47,101 30 20 10,102 0", unitOfKey });
    appendPackedDay({ counts, dayNumber: 19_001, packed: "", unitOfKey });
    appendPackedDay({ counts, dayNumber: 19_002, packed: "100 11", unitOfKey });
    expect(counts.length).toBe(4);
    expect([...counts.unit.subarray(0, 4)]).toEqual([0, 1, 2, 0]);
    expect([...counts.raw.subarray(0, 4)]).toEqual([47, 30, 0, 11]);
    expect([...counts.northRaw.subarray(0, 4)]).toEqual([NO_SPLIT, 20, NO_SPLIT, NO_SPLIT]);
    expect([...counts.southRaw.subarray(0, 4)]).toEqual([NO_SPLIT, 10, NO_SPLIT, NO_SPLIT]);
    expect([...counts.dayNumber.subarray(0, 4)]).toEqual([19_000, 19_000, 19_000, 19_002]);
  });

  it("refuses malformed text, unknown units and days out of order", () => {
    const counts = createAcceptedCounts(4);
    expect(() => appendPackedDay({ counts, dayNumber: 1, packed: "100 4 5", unitOfKey })).toThrow(
      /Malformed/,
    );
    expect(() => appendPackedDay({ counts, dayNumber: 1, packed: "7 4", unitOfKey })).toThrow(/Unknown unit/);
    expect(() => appendPackedDay({ counts, dayNumber: 1, packed: "100 -4", unitOfKey })).toThrow(
      /Unexpected character/,
    );
    appendCount(counts, { dayNumber: 5, unit: 0, raw: 20 });
    expect(() => appendPackedDay({ counts, dayNumber: 4, packed: "100 4", unitOfKey })).toThrow(/day order/);
  });
});

describe("sliceByKey", () => {
  it("cuts rows in day order into contiguous slices per key", () => {
    const counts = createAcceptedCounts(8);
    for (const day of [1, 1, 2, 40, 41, 41, 95]) appendCount(counts, { dayNumber: day, unit: 0, raw: 11 });
    expect(sliceByKey({ counts, keyOf: (d) => Math.floor(d / 30) })).toEqual([
      { key: 0, from: 0, to: 3 },
      { key: 1, from: 3, to: 6 },
      { key: 3, from: 6, to: 7 },
    ]);
    expect(sliceByKey({ counts: createAcceptedCounts(0), keyOf: (d) => d })).toEqual([]);
  });
});
