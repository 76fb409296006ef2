/**
 * The count packs the full recompute keeps beside the observations: the
 * triggers mark every change to an accepted count, the recompute reads
 * unchanged instruments from their packs and the rest from the index, and
 * whatever it reads is exactly what a read of every instrument from the
 * index gives.
 */
import { eq, inArray, sql } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";

import { writeAllOrNothing } from "@/db/bulk-write";
import { getDb } from "@/db/client";
import { forgetKeptCounts, loadAcceptedCounts, runFullRecompute } from "@/db/queries/recompute";
import { observations } from "@/db/schema";

import { insertInstrument, insertObservation, makeUser } from "./support";

type Made = Awaited<ReturnType<typeof makeUser>>;

let first: Made;
let second: Made;
let spare: string;

/** An accepted count unless told otherwise. */
const store = ({ status = "accepted", ...rest }: Parameters<typeof insertObservation>[0]) =>
  insertObservation({ status, ...rest });

async function changes(): Promise<Map<string, number>> {
  const result = await getDb().$client.execute("SELECT instrument_id, seq FROM count_pack_changes");
  return new Map(result.rows.map((r) => [String(r.instrument_id), Number(r.seq)]));
}

async function packs(): Promise<Map<string, number>> {
  const result = await getDb().$client.execute("SELECT instrument_id, count FROM count_packs");
  return new Map(result.rows.map((r) => [String(r.instrument_id), Number(r.count)]));
}

/** Every accepted count as (instrument, day, 10g + s), sorted: what any read must give. */
async function truth(): Promise<string[]> {
  const result = await getDb().$client.execute(
    "SELECT instrument_id, ut_date, 10 * groups + spots AS raw FROM observations WHERE status = 'accepted'",
  );
  return result.rows.map((r) => `${String(r.instrument_id)} ${String(r.ut_date)} ${Number(r.raw)}`).sort();
}

async function read(): Promise<{ rows: string[]; packWrites: number }> {
  const { counts, units, packWrites } = await loadAcceptedCounts();
  const rows = Array.from({ length: counts.length }, (_, i) => {
    const day = new Date(counts.dayNumber[i]! * 86_400_000).toISOString().slice(0, 10);
    return `${units[counts.unit[i]!]!.instrumentId} ${day} ${counts.raw[i]!}`;
  });
  return { rows: rows.sort(), packWrites: packWrites.length };
}

describe("count packs", () => {
  beforeAll(async () => {
    first = await makeUser({ role: "observer" });
    second = await makeUser({ role: "observer" });
    spare = await insertInstrument({ owner: first, name: "Spare refractor" });
    await store({ owner: first, day: "2024-03-01", groups: 2, spots: 7 });
    await store({ owner: first, day: "2024-03-02", groups: 3, spots: 11 });
    await store({ owner: second, day: "2024-03-01", groups: 1, spots: 4 });
    await store({ owner: second, day: "2024-03-03", groups: 4, spots: 20, status: "submitted" });
  });

  it("are marked out of date by every change to an accepted count, and only by those", async () => {
    await runFullRecompute();
    expect(await changes()).toEqual(new Map());
    // Every instrument has a pack, the one without counts an empty one.
    expect(await packs()).toEqual(
      new Map([
        [first.instrument!.id, 2],
        [second.instrument!.id, 1],
        [spare, 0],
      ]),
    );

    // Not accepted, or not a change to the count: nothing marked.
    const waiting = await store({
      owner: first,
      day: "2024-03-04",
      groups: 1,
      spots: 1,
      status: "submitted",
    });
    await getDb().update(observations).set({ status: "queried" }).where(eq(observations.id, waiting));
    const [accepted] = await getDb()
      .select({ id: observations.id })
      .from(observations)
      .where(eq(observations.instrumentId, first.instrument!.id))
      .limit(1);
    await getDb()
      .update(observations)
      .set({ seeing: 4, notes: "Hazy", groups: sql`groups`, updatedAt: new Date() })
      .where(eq(observations.id, accepted!.id));
    expect(await changes()).toEqual(new Map());

    // An accepted count stored, corrected, moved to another instrument, or
    // taken out of the series: its instrument(s) marked, each time with a larger seq.
    const added = await store({ owner: second, day: "2024-03-05", groups: 1, spots: 2 });
    const afterInsert = await changes();
    expect([...afterInsert.keys()]).toEqual([second.instrument!.id]);
    await getDb().update(observations).set({ spots: 3 }).where(eq(observations.id, added));
    const afterUpdate = await changes();
    expect(afterUpdate.get(second.instrument!.id)).toBeGreaterThan(afterInsert.get(second.instrument!.id)!);
    await getDb().update(observations).set({ status: "accepted" }).where(eq(observations.id, waiting));
    await getDb().update(observations).set({ instrumentId: spare }).where(eq(observations.id, accepted!.id));
    expect(new Set((await changes()).keys())).toEqual(
      new Set([first.instrument!.id, second.instrument!.id, spare]),
    );
    await runFullRecompute();
    expect(await changes()).toEqual(new Map());
    await getDb().update(observations).set({ status: "rejected" }).where(eq(observations.id, added));
    expect([...(await changes()).keys()]).toEqual([second.instrument!.id]);
    await getDb().delete(observations).where(eq(observations.id, waiting));
    expect(new Set((await changes()).keys())).toEqual(new Set([first.instrument!.id, second.instrument!.id]));
    await runFullRecompute();
  });

  it("give exactly what reading every instrument from the index gives", async () => {
    await store({ owner: first, instrumentId: spare, day: "2024-03-06", groups: 5, spots: 31 });
    // Read from the packs, and from the index for the one changed instrument.
    const mixed = await read();
    expect(mixed.rows).toEqual(await truth());
    await runFullRecompute();
    // Nothing changed: everything from the packs, nothing to write.
    expect(await read()).toEqual({ rows: await truth(), packWrites: 0 });
    // No packs at all: everything from the index, same counts.
    await getDb().$client.execute("DELETE FROM count_packs");
    expect((await read()).rows).toEqual(await truth());
    await runFullRecompute();
    expect((await packs()).size).toBe(3);
  });

  it("are rebuilt when one cannot be trusted", async () => {
    const client = getDb().$client;
    for (const damage of [
      "UPDATE count_packs SET packed = x'0102' WHERE count > 0",
      "UPDATE count_packs SET format = 99",
      "UPDATE count_packs SET count = count + 1 WHERE count > 0",
    ]) {
      await client.execute(damage);
      expect((await read()).rows).toEqual(await truth());
      // A recompute that reads the packs (this one's kept counts would
      // otherwise stand in for them, as nothing has changed).
      forgetKeptCounts();
      await runFullRecompute();
      expect(await read()).toEqual({ rows: await truth(), packWrites: 0 });
    }
  });

  it("keep a change made while a recompute ran for the next one", async () => {
    // A change the recompute reads, and so clears.
    await store({ owner: first, day: "2024-03-07", groups: 1, spots: 1 });
    const before = await loadAcceptedCounts();
    // Accepted after the recompute's read, before its write.
    const late = await store({ owner: second, day: "2024-03-07", groups: 2, spots: 2 });
    await writeAllOrNothing(getDb(), before.packWrites);
    await writeAllOrNothing(getDb(), (await loadAcceptedCounts()).packWrites);
    expect([...(await changes()).keys()]).toEqual([]);
    const after = await read();
    expect(after.rows).toEqual(await truth());
    expect(after.rows).toContain(`${second.instrument!.id} 2024-03-07 22`);

    // The same with a change made after the read, written with that read's packs.
    await store({ owner: first, day: "2024-03-08", groups: 1, spots: 1 });
    const stale = await loadAcceptedCounts();
    await getDb().update(observations).set({ spots: 5 }).where(eq(observations.id, late));
    expect(stale.packWrites.length).toBeGreaterThan(0);
    await writeAllOrNothing(getDb(), stale.packWrites);
    expect([...(await changes()).keys()]).toEqual([second.instrument!.id]);
    expect((await read()).rows).toContain(`${second.instrument!.id} 2024-03-07 25`);
  });

  it("are kept in memory from one recompute to the next while nothing changes", async () => {
    await runFullRecompute();
    expect((await runFullRecompute()).countsReused).toBe(true);
    const daily = async () =>
      (
        await getDb().$client.execute(
          "SELECT observers, sum FROM series_daily WHERE day = '2024-03-09' AND hemisphere = 'all'",
        )
      ).rows.map((r) => ({ ...r }));

    // A count accepted meanwhile (the review desk's way in, or any other):
    // read again, and in the series.
    const id = await store({ owner: second, day: "2024-03-09", groups: 2, spots: 5 });
    const afterCount = await runFullRecompute();
    expect(afterCount.countsReused).toBe(false);
    expect(await daily()).toEqual([{ observers: 1, sum: 25 }]);
    expect((await runFullRecompute()).countsReused).toBe(true);

    // Corrected in place, by a plain UPDATE: read again.
    await getDb().update(observations).set({ spots: 9 }).where(eq(observations.id, id));
    expect((await runFullRecompute()).countsReused).toBe(false);
    expect(await daily()).toEqual([{ observers: 1, sum: 29 }]);

    // A new instrument changes the units the arrays refer to.
    await insertInstrument({ owner: second, name: "Solar projection box" });
    expect((await runFullRecompute()).countsReused).toBe(false);
    // Packs removed by someone else: read again, and stored again.
    await getDb().$client.execute("DELETE FROM count_packs");
    expect((await runFullRecompute()).countsReused).toBe(false);
    expect(await read()).toEqual({ rows: await truth(), packWrites: 0 });
    expect((await runFullRecompute()).countsReused).toBe(true);
  });

  it("of instruments deleted since go", async () => {
    const gone = await insertInstrument({ owner: second, name: "Borrowed binoculars" });
    const id = await store({ owner: second, instrumentId: gone, day: "2024-03-08", groups: 1, spots: 0 });
    await runFullRecompute();
    expect((await packs()).get(gone)).toBe(1);
    await getDb()
      .delete(observations)
      .where(inArray(observations.id, [id]));
    await getDb().$client.execute({ sql: "DELETE FROM instruments WHERE id = ?", args: [gone] });
    await runFullRecompute();
    expect((await packs()).has(gone)).toBe(false);
    expect(await read()).toEqual({ rows: await truth(), packWrites: 0 });
  });
});
