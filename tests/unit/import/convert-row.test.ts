import { describe, expect, it } from "vitest";

import { acceptWellFormedRow, makeRowConverter } from "@/lib/import/convert-row";
import { importOptionsSchema } from "@/lib/validation/import";
import { makeObservationInputSchema } from "@/lib/validation/observation";

const NOW = new Date("2026-03-14T12:00:00Z");
const schema = makeObservationInputSchema({ now: () => NOW });

/** A small deterministic generator (mulberry32), so a failure can be replayed. */
function makeRandom(seed: number) {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

// Cells that sit on every edge of the schema's rules: empty, negative, zero,
// the maxima and one past them, fractions, exponents, hex, words, infinity.
const ODD_NUMBERS = [
  "",
  "-1",
  "-0",
  "0",
  "1",
  "2.5",
  "1e1",
  "0x3",
  "abc",
  "Infinity",
  "NaN",
  "60",
  "61",
  "1500",
  "1501",
  "5",
  "6",
  "+4",
  "07",
  "1_0",
];
const ODD_INSTANTS = [
  "1609-12-31T23:59:59.999Z",
  "1610-01-01T00:00:00.000Z",
  "1859-09-01T11:18:00.000Z",
  "2026-03-14T12:05:00.000Z",
  "2026-03-14T12:05:00.001Z",
  "2099-01-01T00:00:00.000Z",
];

function generateRow(random: () => number, { good }: { good: boolean }) {
  const pick = <T>(list: readonly T[]): T => list[Math.floor(random() * list.length)]!;
  const int = (max: number) => Math.floor(random() * (max + 1));
  const odd = () => (good ? undefined : random() < 0.1 ? pick(ODD_NUMBERS) : undefined);
  const groups = int(12);
  const spots = groups === 0 ? 0 : groups + int(40);
  const northGroups = int(groups);
  const southGroups = groups - northGroups;
  const extra = spots - groups;
  const northSpots = northGroups + (northGroups === 0 ? 0 : southGroups === 0 ? extra : int(extra));
  const southSpots = spots - northSpots;
  const withHemispheres = random() < 0.5;
  const hemisphere = (value: number) => odd() ?? (withHemispheres ? String(value) : "");
  const at = good
    ? new Date(Date.UTC(1610, 0, 1) + Math.floor(random() * (NOW.getTime() - Date.UTC(1610, 0, 1))))
    : new Date(
        random() < 0.3 ? pick(ODD_INSTANTS) : Date.UTC(1700 + int(300), int(11), 1 + int(27), int(23)),
      );
  const notesLength = good ? pick([0, 0, 12, 2000]) : pick([0, 12, 2000, 2001]);
  return {
    at,
    seeing: random() < 0.1 ? 1 + int(4) : (odd() ?? String(1 + int(4))),
    instrumentId: good ? "inst-1" : pick(["inst-1", "", " ", "x".repeat(64), "x".repeat(65)]),
    groups: odd() ?? String(groups),
    spots: odd() ?? String(spots),
    northGroups: hemisphere(northGroups),
    northSpots: hemisphere(northSpots),
    southGroups: hemisphere(southGroups),
    southSpots: hemisphere(southSpots),
    notes: "n".repeat(notesLength),
  };
}

function parseWithSchema(row: ReturnType<typeof generateRow>) {
  const { at, ...rest } = row;
  return schema.safeParse({ observedAt: at.toISOString(), ...rest });
}

describe("acceptWellFormedRow (the import's fast path)", () => {
  it("accepts every good generated line, with exactly the schema's values", () => {
    const random = makeRandom(7);
    for (let i = 0; i < 3000; i++) {
      const row = generateRow(random, { good: true });
      const parsed = parseWithSchema(row);
      expect(parsed.success, JSON.stringify(row)).toBe(true);
      const quick = acceptWellFormedRow({ ...row, nowMs: NOW.getTime() });
      expect(quick, JSON.stringify(row)).not.toBeNull();
      expect(quick).toEqual(parsed.data);
    }
  });

  it("never accepts a line the schema refuses, and agrees on the values of those it accepts", () => {
    const random = makeRandom(11);
    let refused = 0;
    let acceptedQuickly = 0;
    for (let i = 0; i < 20000; i++) {
      const row = generateRow(random, { good: false });
      const parsed = parseWithSchema(row);
      const quick = acceptWellFormedRow({ ...row, nowMs: NOW.getTime() });
      if (!parsed.success) {
        refused++;
        expect(quick, JSON.stringify(row)).toBeNull();
      } else if (quick) {
        acceptedQuickly++;
        expect(quick, JSON.stringify(row)).toEqual(parsed.data);
      }
    }
    // Both kinds must be well represented for the check to mean anything.
    expect(refused).toBeGreaterThan(5000);
    expect(acceptedQuickly).toBeGreaterThan(1000);
  });
});

describe("makeRowConverter", () => {
  const options = importOptionsSchema.parse({
    date: "1",
    groups: "2",
    spots: "3",
    northGroups: "4",
    northSpots: "5",
    southGroups: "6",
    southSpots: "7",
    seeing: "8",
    notes: "9",
    dateFormat: "yyyy-mm-dd",
    timeZone: "UTC",
    instrumentId: "inst-1",
  });
  const convert = makeRowConverter({ options, instruments: [{ id: "inst-1", name: "Pinhole" }], now: NOW });

  it("gives a good line the schema's values", () => {
    const result = convert(["2024-03-17", "3", "11", "1", "4", "2", "7", "2", " cirrus "], 2);
    expect(result).toEqual({
      ok: true,
      input: {
        observedAt: new Date("2024-03-17T12:00:00Z"),
        seeing: 2,
        instrumentId: "inst-1",
        groups: 3,
        spots: 11,
        northGroups: 1,
        northSpots: 4,
        southGroups: 2,
        southSpots: 7,
        notes: "cirrus",
      },
    });
  });

  it("still words a bad line's problems with the schema's messages", () => {
    const result = convert(["2024-03-17", "0", "4", "", "", "", "", "2", ""], 5);
    expect(result).toEqual({
      ok: false,
      problems: [
        {
          line: 5,
          field: "spots",
          value: "4",
          reason: "Spots were counted but no groups: every spot belongs to a group.",
        },
      ],
    });
  });
});
