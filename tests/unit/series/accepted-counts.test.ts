import { describe, expect, it } from "vitest";

import { formatDayNumber, toDayNumber } from "@/lib/counts/series";
import {
  appendCount,
  countsFromPacks,
  createAcceptedCounts,
  NO_SPLIT,
  sliceByKey,
} from "@/lib/series/accepted-counts";
import { COUNT_PACK_BYTES_PER_COUNT, packsFromPackedText, readCountPack } from "@/lib/series/count-packs";
import { PACKED_DAY_OFFSET, PACKED_FIELD_LIMIT } from "@/lib/series/packed-count";
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

/** Units read from packed text, as the recompute reads the instruments it must rebuild. */
function fromText(packed: string, counts: number[], unitIds: number[]) {
  return packsFromPackedText(packed, counts).map(({ pack }, i) => ({ unit: unitIds[i]!, pack }));
}

describe("packsFromPackedText and countsFromPacks", () => {
  it("reads plain and split counts and puts them in day order", () => {
    const shared =
      pack({ day: "2022-01-02", raw: 30, north: 20, south: 10 }) +
      pack({ day: "2022-01-04", raw: 11 }) +
      pack({ day: "2021-12-31", raw: 47 });
    const counts = countsFromPacks([
      ...fromText(shared, [2, 0, 1], [1, 0, 3]),
      ...fromText(pack({ day: "2022-01-02", raw: 0, north: 0, south: 0 }), [1], [2]),
    ]);
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
    const counts = countsFromPacks(
      fromText(
        days.map((day) => pack({ day, raw: largest, north: largest, south: 0 })).join(""),
        [days.length],
        [0],
      ),
    );
    expect([...counts.dayNumber]).toEqual(days.map((d) => toDayNumber(d)));
    expect(new Set(counts.raw)).toEqual(new Set([largest]));
    expect(new Set(counts.northRaw)).toEqual(new Set([largest]));
  });

  it("has room for every count the validation allows", () => {
    expect(10 * MAX_GROUPS + MAX_SPOTS + 1).toBeLessThanOrEqual(PACKED_FIELD_LIMIT);
    expect(String(toDayNumber("1610-01-01") + PACKED_DAY_OFFSET)).toHaveLength(6);
    expect(String(toDayNumber("3800-12-31") + PACKED_DAY_OFFSET)).toHaveLength(6);
  });

  it("refuses text that does not hold exactly the counts expected, and anything but digits", () => {
    const one = pack({ day: "2022-01-02", raw: 4 });
    for (const [packed, counts] of [
      [one, [2]],
      [one, [0]],
      [one, [1, 1]],
      [one, [-1, 2]],
      [one, [0.5, 0.5]],
      [one.slice(0, 17), [1]],
      [`${one}7`, [1]],
      [`${one.slice(0, 8)}-${one.slice(9)}`, [1]],
      [`-1${one.slice(2)}`, [1]],
      // Characters just past "9" and just before "0", in each field.
      [`${one.slice(0, 5)}:${one.slice(6)}`, [1]],
      [`${one.slice(0, 11)}/${one.slice(12)}`, [1]],
      [`${one.slice(0, 17)}a`, [1]],
    ] as const)
      expect(() => packsFromPackedText(packed, [...counts]), JSON.stringify([packed, counts])).toThrow(
        RangeError,
      );
  });

  it("puts many units' counts in the order a plain sort gives", () => {
    // Invented counts: 40 units, each on a random subset of 300 days, some
    // with a day of two counts, a few with none.
    let seed = 7;
    const random = () => (seed = (seed * 48_271) % 2_147_483_647) / 2_147_483_647;
    const rows: Array<{ day: number; unit: number; raw: number; north: number | undefined }> = [];
    const units = Array.from({ length: 40 }, (_, unit) => {
      const mine: typeof rows = [];
      for (let day = 19_000; day < 19_300; day++) {
        if (unit % 13 === 5 || random() > 0.4) continue;
        const repeats = random() < 0.05 ? 2 : 1;
        for (let r = 0; r < repeats; r++)
          mine.push({ day, unit, raw: Math.floor(random() * 300), north: unit % 3 ? undefined : 4 });
      }
      rows.push(...mine);
      const text = mine
        .map((m) => pack({ day: formatDayNumber(m.day), raw: m.raw, north: m.north, south: m.north }))
        .join("");
      return fromText(text, [mine.length], [unit])[0]!;
    });
    // Given in reverse unit order: within a day, rows follow that order.
    const counts = countsFromPacks([...units].reverse());
    const expected = rows
      .map((row, position) => ({ ...row, position }))
      .sort((a, b) => a.day - b.day || b.unit - a.unit || a.position - b.position);
    expect(counts.length).toBe(expected.length);
    expect([...counts.dayNumber]).toEqual(expected.map((r) => r.day));
    expect([...counts.unit]).toEqual(expected.map((r) => r.unit));
    expect([...counts.raw]).toEqual(expected.map((r) => r.raw));
    expect([...counts.northRaw]).toEqual(expected.map((r) => r.north ?? NO_SPLIT));
  });

  it("reads no units as no counts", () => {
    expect(countsFromPacks([]).length).toBe(0);
    expect(countsFromPacks(fromText("", [0], [0])).length).toBe(0);
  });
});

describe("count packs as stored", () => {
  const text =
    pack({ day: "1610-01-01", raw: 0 }) +
    pack({ day: "2022-01-02", raw: 30, north: 20, south: 10 }) +
    pack({
      day: "3800-12-31",
      raw: 10 * MAX_GROUPS + MAX_SPOTS,
      north: 0,
      south: 10 * MAX_GROUPS + MAX_SPOTS,
    });
  const { bytes } = packsFromPackedText(text, [3])[0]!;

  it("are ten little-endian bytes per count, days first, and read back the same counts", () => {
    expect(bytes.byteLength).toBe(3 * COUNT_PACK_BYTES_PER_COUNT);
    const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
    expect(view.getInt32(4, true)).toBe(toDayNumber("2022-01-02"));
    // The second count's fields: 10g + s, north + 1, south + 1.
    expect([0, 1, 2].map((i) => view.getUint16(12 + 6 + 2 * i, true))).toEqual([30, 21, 11]);
    // A copy at an odd offset (as a database driver may hand it over) reads the same.
    const shifted = new Uint8Array(bytes.byteLength + 1);
    shifted.set(bytes, 1);
    for (const stored of [bytes.slice().buffer, shifted.subarray(1)]) {
      const read = readCountPack(stored, 3);
      expect(read).not.toBeNull();
      expect(countsFromPacks([{ unit: 5, pack: read! }])).toEqual(countsFromPacks(fromText(text, [3], [5])));
    }
  });

  it("are refused when their length, days or values cannot be right", () => {
    expect(readCountPack(bytes, 2)).toBeNull();
    expect(readCountPack(bytes, 4)).toBeNull();
    expect(readCountPack(bytes, -1)).toBeNull();
    const badDay = bytes.slice();
    new DataView(badDay.buffer).setInt32(0, 2_000_000, true);
    expect(readCountPack(badDay, 3)).toBeNull();
    const badValue = bytes.slice();
    new DataView(badValue.buffer).setUint16(12, PACKED_FIELD_LIMIT + 1, true);
    expect(readCountPack(badValue, 3)).toBeNull();
    const outOfOrder = bytes.slice();
    new DataView(outOfOrder.buffer).setInt32(8, toDayNumber("2022-01-01"), true);
    expect(readCountPack(outOfOrder, 3)).toBeNull();
    expect(readCountPack(new Uint8Array(0), 0)).toEqual(expect.objectContaining({ count: 0 }));
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
