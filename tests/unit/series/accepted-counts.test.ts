import { describe, expect, it } from "vitest";

import { toDayNumber } from "@/lib/counts/series";
import {
  appendCount,
  countsFromPackedUnits,
  createAcceptedCounts,
  NO_SPLIT,
  sliceByKey,
  type PackedUnit,
} from "@/lib/series/accepted-counts";
import { PACKED_DAY_OFFSET, PACKED_FIELD_LIMIT, PACKED_WIDTH } from "@/lib/series/packed-count";
import { MAX_GROUPS, MAX_SPOTS } from "@/lib/validation/observation";

/** The packed form of one count, written here from the format's description (lib/series/packed-count.ts). */
function pack({ day, raw, north, south }: { day: string; raw: number; north?: number; south?: number }) {
  const digits = (value: number, width: number) => String(value).padStart(width, "0");
  const split = north === undefined || south === undefined;
  return (
    digits(toDayNumber(day) + PACKED_DAY_OFFSET, 6) +
    digits(raw, 4) +
    digits(split ? 0 : north + 1, 4) +
    digits(split ? 0 : south + 1, 4)
  );
}

describe("countsFromPackedUnits", () => {
  it("reads plain and split counts from shared strings and puts them in day order", () => {
    const shared =
      pack({ day: "2022-01-02", raw: 30, north: 20, south: 10 }) +
      pack({ day: "2022-01-04", raw: 11 }) +
      pack({ day: "2021-12-31", raw: 47 });
    const units: PackedUnit[] = [
      { unit: 1, packed: shared, from: 0, count: 2 },
      { unit: 0, packed: shared, from: 2 * PACKED_WIDTH, count: 0 },
      { unit: 3, packed: shared, from: 2 * PACKED_WIDTH, count: 1 },
      { unit: 2, packed: pack({ day: "2022-01-02", raw: 0, north: 0, south: 0 }), from: 0, count: 1 },
    ];
    const counts = countsFromPackedUnits(units);
    expect(counts.length).toBe(4);
    // toDayNumber is the reference for the day field.
    expect([...counts.dayNumber]).toEqual(
      ["2021-12-31", "2022-01-02", "2022-01-02", "2022-01-04"].map((d) => toDayNumber(d)),
    );
    // Within a day, the order the units were given in.
    expect([...counts.unit]).toEqual([3, 1, 2, 1]);
    expect([...counts.raw]).toEqual([47, 30, 0, 11]);
    expect([...counts.northRaw]).toEqual([NO_SPLIT, 20, 0, NO_SPLIT]);
    expect([...counts.southRaw]).toEqual([NO_SPLIT, 10, 0, NO_SPLIT]);
  });

  it("reads days across centuries, leap days and the largest counts allowed", () => {
    const days = ["1610-01-01", "1899-12-31", "1970-01-01", "2000-02-29", "2024-03-01", "2100-02-28"];
    const largest = 10 * MAX_GROUPS + MAX_SPOTS;
    const counts = countsFromPackedUnits([
      {
        unit: 0,
        packed: days.map((day) => pack({ day, raw: largest, north: largest, south: 0 })).join(""),
        from: 0,
        count: days.length,
      },
    ]);
    expect([...counts.dayNumber]).toEqual(days.map((d) => toDayNumber(d)));
    expect(new Set(counts.raw)).toEqual(new Set([largest]));
    expect(new Set(counts.northRaw)).toEqual(new Set([largest]));
  });

  it("has room for every count the validation allows", () => {
    expect(10 * MAX_GROUPS + MAX_SPOTS + 1).toBeLessThanOrEqual(PACKED_FIELD_LIMIT);
    expect(String(toDayNumber("1610-01-01") + PACKED_DAY_OFFSET)).toHaveLength(6);
    expect(String(toDayNumber("3800-12-31") + PACKED_DAY_OFFSET)).toHaveLength(6);
  });

  it("refuses a unit that runs past its string, and anything but digits", () => {
    const one = pack({ day: "2022-01-02", raw: 4 });
    for (const unit of [
      { unit: 0, packed: one, from: 0, count: 2 },
      { unit: 0, packed: one, from: 1, count: 1 },
      { unit: 0, packed: one, from: -1, count: 1 },
      { unit: 0, packed: one.slice(0, 17), from: 0, count: 1 },
      { unit: 0, packed: `${one.slice(0, 8)}-${one.slice(9)}`, from: 0, count: 1 },
      { unit: 0, packed: `-1${one.slice(2)}`, from: 0, count: 1 },
      // Characters just past "9" and just before "0", in each field.
      { unit: 0, packed: `${one.slice(0, 5)}:${one.slice(6)}`, from: 0, count: 1 },
      { unit: 0, packed: `${one.slice(0, 11)}/${one.slice(12)}`, from: 0, count: 1 },
      { unit: 0, packed: `${one.slice(0, 17)}a`, from: 0, count: 1 },
    ])
      expect(() => countsFromPackedUnits([unit]), JSON.stringify(unit)).toThrow(RangeError);
  });

  it("reads no units as no counts", () => {
    expect(countsFromPackedUnits([]).length).toBe(0);
    expect(countsFromPackedUnits([{ unit: 0, packed: "", from: 0, count: 0 }]).length).toBe(0);
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
