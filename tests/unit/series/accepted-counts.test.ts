import { describe, expect, it } from "vitest";

import { toDayNumber } from "@/lib/counts/series";
import {
  appendCount,
  appendPackedUnit,
  createAcceptedCounts,
  NO_SPLIT,
  sliceByKey,
  sortCountsByDay,
} from "@/lib/series/accepted-counts";

describe("appendPackedUnit and sortCountsByDay", () => {
  it("reads plain and split counts, grows the arrays, and sorts them into day order", () => {
    const byUnit = createAcceptedCounts(1);
    appendPackedUnit({ counts: byUnit, unit: 1, packed: "2022-01-02 30 20 10,2022-01-04 11" });
    appendPackedUnit({ counts: byUnit, unit: 0, packed: "" });
    appendPackedUnit({ counts: byUnit, unit: 2, packed: "2022-01-02 0,2021-12-31 47" });
    const counts = sortCountsByDay(byUnit);
    expect(counts.length).toBe(4);
    // toDayNumber is the reference for the hand-written date reader.
    expect([...counts.dayNumber.subarray(0, 4)]).toEqual(
      ["2021-12-31", "2022-01-02", "2022-01-02", "2022-01-04"].map((d) => toDayNumber(d)),
    );
    // Within a day, the order the units were appended in.
    expect([...counts.unit.subarray(0, 4)]).toEqual([2, 1, 2, 1]);
    expect([...counts.raw.subarray(0, 4)]).toEqual([47, 30, 0, 11]);
    expect([...counts.northRaw.subarray(0, 4)]).toEqual([NO_SPLIT, 20, NO_SPLIT, NO_SPLIT]);
    expect([...counts.southRaw.subarray(0, 4)]).toEqual([NO_SPLIT, 10, NO_SPLIT, NO_SPLIT]);
  });

  it("reads days across centuries and leap days as toDayNumber does", () => {
    const days = ["1600-02-29", "1899-12-31", "1970-01-01", "2000-02-29", "2024-03-01", "2100-02-28"];
    const counts = createAcceptedCounts(1);
    appendPackedUnit({ counts, unit: 0, packed: days.map((d) => `${d} 11`).join(",") });
    expect([...counts.dayNumber.subarray(0, counts.length)]).toEqual(days.map((d) => toDayNumber(d)));
  });

  it("refuses malformed text", () => {
    const counts = createAcceptedCounts(4);
    for (const packed of [
      "2022-01-02 4 5",
      "2022-01-02",
      "2022-01-02 -4",
      "2022/01/02 4",
      "2022-13-02 4",
      "2022-01-02 4;",
    ])
      expect(() => appendPackedUnit({ counts, unit: 0, packed }), packed).toThrow(RangeError);
  });

  it("sorts an empty set", () => {
    expect(sortCountsByDay(createAcceptedCounts(0)).length).toBe(0);
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
