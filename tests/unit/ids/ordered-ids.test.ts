import { describe, expect, it } from "vitest";
import { z } from "zod";

import { LINE_COUNTER_BITS, makeOrderedIdMaker } from "@/lib/ids/ordered-ids";

// RFC 9562 §5.7: version 7 in the 13th hex digit, variant binary 10 in the 17th.
const UUID_V7 = /^[0-9a-f]{8}-[0-9a-f]{4}-7[0-9a-f]{3}-[89ab][0-9a-f]{3}-[0-9a-f]{12}$/;
const START_MS = Date.UTC(2026, 2, 14, 12, 0, 0, 123);

/** The 48-bit Unix-millisecond timestamp at the front of a version-7 UUID. */
const timestampOf = (id: string) => Number.parseInt(id.slice(0, 8) + id.slice(9, 13), 16);

describe("makeOrderedIdMaker", () => {
  it("makes standard version-7 UUIDs stamped with the import's start", () => {
    const makeId = makeOrderedIdMaker({ startMs: START_MS });
    for (const line of [0, 1, 2, 4095, 4096, 16_383, 16_384, 100_001, 2 ** LINE_COUNTER_BITS - 1]) {
      const id = makeId(line);
      expect(id).toMatch(UUID_V7);
      expect(z.uuid().safeParse(id).success).toBe(true);
      expect(timestampOf(id)).toBe(START_MS);
    }
  });

  it("sorts the ids of one import in line order, with no repeats", () => {
    const makeId = makeOrderedIdMaker({ startMs: START_MS });
    const lines = [
      2,
      3,
      5,
      4096,
      4097,
      16_384,
      70_000,
      100_001,
      2 ** LINE_COUNTER_BITS - 1,
      2 ** LINE_COUNTER_BITS,
    ];
    const ids = lines.map(makeId);
    expect([...ids].sort()).toEqual(ids);
    const many = Array.from({ length: 20_000 }, (_, i) => makeId(i + 2));
    expect(new Set(many).size).toBe(many.length);
    expect([...many].sort()).toEqual(many);
  });

  it("moves on to the next millisecond past the counter's range", () => {
    const makeId = makeOrderedIdMaker({ startMs: START_MS });
    const past = makeId(2 ** LINE_COUNTER_BITS + 5);
    expect(past).toMatch(UUID_V7);
    expect(timestampOf(past)).toBe(START_MS + 1);
  });

  it("gives two imports of the same millisecond different ids for the same line", () => {
    const first = makeOrderedIdMaker({ startMs: START_MS });
    const second = makeOrderedIdMaker({ startMs: START_MS });
    expect(first(2)).not.toBe(second(2));
    expect(first(3).slice(0, 23)).toBe(second(3).slice(0, 23));
  });

  it("refuses what is not a line number", () => {
    const makeId = makeOrderedIdMaker({ startMs: START_MS });
    expect(() => makeId(-1)).toThrow(RangeError);
    expect(() => makeId(1.5)).toThrow(RangeError);
  });
});
