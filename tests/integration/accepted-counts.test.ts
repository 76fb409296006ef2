/**
 * The full recompute's read (loadAcceptedCounts) against a plain SQL read of
 * the same rows: the packed values the database keeps in its index must
 * decode to exactly the stored counts, days and splits.
 */
import { beforeAll, describe, expect, it } from "vitest";

import { getDb } from "@/db/client";
import { loadAcceptedCounts, packedBatchSql } from "@/db/queries/recompute";
import { acceptedPackedIndexHint } from "@/db/queries/series";
import { observations, type ObservationStatus } from "@/db/schema";
import { toDayNumber } from "@/lib/counts/series";
import { NO_SPLIT } from "@/lib/series/accepted-counts";
import { MAX_GROUPS, MAX_SPOTS } from "@/lib/validation/observation";

import { insertInstrument, makeUser } from "./support";

type Row = {
  day: string;
  groups: number;
  spots: number;
  north?: [number, number];
  south?: [number, number];
  status?: ObservationStatus;
};

async function store({
  observerId,
  instrumentId,
  rows,
}: {
  observerId: string;
  instrumentId: string;
  rows: Row[];
}) {
  await getDb()
    .insert(observations)
    .values(
      rows.map((row) => ({
        observerId,
        instrumentId,
        observedAt: new Date(`${row.day}T10:00:00Z`),
        utDate: row.day,
        seeing: 2,
        groups: row.groups,
        spots: row.spots,
        northGroups: row.north?.[0] ?? null,
        northSpots: row.north?.[1] ?? null,
        southGroups: row.south?.[0] ?? null,
        southSpots: row.south?.[1] ?? null,
        status: row.status ?? "accepted",
      })),
    );
}

describe("loadAcceptedCounts", () => {
  beforeAll(async () => {
    const first = await makeUser({ role: "observer" });
    const second = await makeUser({ role: "observer" });
    const spare = await insertInstrument({ owner: first, name: "Small refractor" });
    await store({
      observerId: first.observer!.id,
      instrumentId: first.instrument!.id,
      rows: [
        // Stored out of day order, across centuries and leap days.
        { day: "2000-02-29", groups: 3, spots: 12, north: [2, 8], south: [1, 4] },
        { day: "1610-01-01", groups: 1, spots: 1 },
        { day: "1899-12-31", groups: 0, spots: 0, north: [0, 0], south: [0, 0] },
        {
          day: "2100-02-28",
          groups: MAX_GROUPS,
          spots: MAX_SPOTS,
          north: [MAX_GROUPS, MAX_SPOTS],
          south: [0, 0],
        },
        // A split given for one hemisphere only counts as no split.
        { day: "2024-06-01", groups: 2, spots: 9, north: [2, 9] },
        { day: "2024-06-02", groups: 5, spots: 30, status: "submitted" },
        { day: "2024-06-03", groups: 5, spots: 30, status: "rejected" },
      ],
    });
    await store({
      observerId: first.observer!.id,
      instrumentId: spare,
      rows: [
        { day: "2024-06-01", groups: 4, spots: 17 },
        { day: "2024-06-01", groups: 4, spots: 19 },
      ],
    });
    await store({
      observerId: second.observer!.id,
      instrumentId: second.instrument!.id,
      rows: [
        { day: "2024-06-01", groups: 1, spots: 3, north: [0, 0], south: [1, 3] },
        { day: "1970-01-01", groups: 2, spots: 5 },
        { day: "2024-05-31", groups: 7, spots: 41, status: "queried" },
      ],
    });
  });

  it("decodes every accepted count exactly as stored, in day order", async () => {
    const { counts, units, countOfUnit } = await loadAcceptedCounts();
    const read = Array.from({ length: counts.length }, (_, i) => ({
      day: counts.dayNumber[i]!,
      instrumentId: units[counts.unit[i]!]!.instrumentId,
      raw: counts.raw[i]!,
      north: counts.northRaw[i]!,
      south: counts.southRaw[i]!,
    }));

    // The reference: the same rows read plainly, sums and days worked out here.
    const stored = await getDb().$client.execute(
      `SELECT ut_date, instrument_id, groups, spots, north_groups, north_spots, south_groups, south_spots
       FROM observations WHERE status = 'accepted'`,
    );
    const split = (g: unknown, s: unknown) => (g === null || s === null ? null : 10 * Number(g) + Number(s));
    const expected = stored.rows.map((row) => {
      const north = split(row.north_groups, row.north_spots);
      const south = split(row.south_groups, row.south_spots);
      const whole = north !== null && south !== null;
      return {
        day: toDayNumber(String(row.ut_date)),
        instrumentId: String(row.instrument_id),
        raw: 10 * Number(row.groups) + Number(row.spots),
        north: whole ? north : NO_SPLIT,
        south: whole ? south : NO_SPLIT,
      };
    });
    const byKey = (a: (typeof expected)[number], b: (typeof expected)[number]) =>
      a.day - b.day || a.instrumentId.localeCompare(b.instrumentId) || a.raw - b.raw;
    expect([...read].sort(byKey)).toEqual([...expected].sort(byKey));
    expect(read).toHaveLength(9);
    // Each unit's number of accepted counts, as the pilot choice uses it.
    expect([...countOfUnit]).toEqual(
      units.map((unit) => expected.filter((row) => row.instrumentId === unit.instrumentId).length),
    );

    // Day order, as the k fit and the series need it.
    for (let i = 1; i < counts.length; i++)
      expect(counts.dayNumber[i]!).toBeGreaterThanOrEqual(counts.dayNumber[i - 1]!);
    expect(read.find((r) => r.raw === 10 * MAX_GROUPS + MAX_SPOTS)).toMatchObject({
      day: toDayNumber("2100-02-28"),
      north: 10 * MAX_GROUPS + MAX_SPOTS,
      south: 0,
    });
  });

  it("reads the packed values from the index and never touches the table", async () => {
    const client = getDb().$client;
    const hint = await acceptedPackedIndexHint();
    expect(hint).toContain("observations_accepted_packed_idx");
    const program = await client.execute({
      sql: `EXPLAIN ${packedBatchSql({ hint, instruments: 2 })}`,
      args: ["a", "b"],
    });
    const root = await client.execute(
      "SELECT rootpage FROM sqlite_master WHERE type = 'table' AND name = 'observations'",
    );
    const tableCursors = new Set(
      program.rows
        .filter((op) => op.opcode === "OpenRead" && op.p2 === root.rows[0]!.rootpage)
        .map((op) => op.p1),
    );
    // The table is opened (SQLite always does), but no value is read from it:
    // the packed value comes from the index, which the index's expression
    // matching the query's is what allows.
    const tableReads = program.rows.filter(
      (op) =>
        ["Column", "Rowid", "SeekRowid", "NotExists"].includes(String(op.opcode)) && tableCursors.has(op.p1),
    );
    expect(tableCursors.size).toBe(1);
    expect(tableReads).toEqual([]);
  });
});
