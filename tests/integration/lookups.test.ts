/**
 * lookupFirstRow (db/client.ts): the per-request lookups on their own
 * prepared statements must answer exactly as the client does, and see every
 * committed write at once.
 */
import { describe, expect, it } from "vitest";

import { getDb, lookupFirstRow, openDatabase } from "@/db/client";
import { getSessionIdentity } from "@/db/queries/users";
import { bumpSeriesRevisionStatement, getSeriesRevision } from "@/db/queries/series";

import { makeUser } from "./support";

describe("lookupFirstRow", () => {
  it("answers as the client does: one row as an array, numbers as numbers, nothing as undefined", async () => {
    const db = getDb();
    const sql = "SELECT ?1 AS text, 42 AS whole, 2.5 AS fraction, NULL AS empty, 9007199254740991 AS largest";
    const viaLookup = await lookupFirstRow(db, sql, ["x"]);
    const viaClient = (await db.$client.execute({ sql, args: ["x"] })).rows[0]!;
    expect(viaLookup).toEqual(["x", 42, 2.5, null, Number.MAX_SAFE_INTEGER]);
    expect(viaLookup).toEqual([0, 1, 2, 3, 4].map((i) => viaClient[i]));
    expect(await lookupFirstRow(db, "SELECT 1 FROM users WHERE id = ?", ["nobody"])).toBeUndefined();
  });

  it("sees a write the moment it is committed", async () => {
    const before = await getSeriesRevision();
    await getDb().$client.execute(bumpSeriesRevisionStatement());
    expect(await getSeriesRevision()).toBe(before + 1);

    const coordinator = await makeUser({ role: "coordinator" });
    expect(await getSessionIdentity({ userId: coordinator.user.id })).toMatchObject({
      id: coordinator.user.id,
      role: "coordinator",
      disabledAt: null,
    });
    await getDb().$client.execute({
      sql: "UPDATE users SET role = 'observer', disabled_at = ? WHERE id = ?",
      args: [Date.UTC(2026, 0, 2), coordinator.user.id],
    });
    expect(await getSessionIdentity({ userId: coordinator.user.id })).toMatchObject({
      role: "observer",
      disabledAt: new Date(Date.UTC(2026, 0, 2)),
    });
    expect(await getSessionIdentity({ userId: "nobody" })).toBeNull();
  });

  it("goes through the client where it cannot open a connection of its own (an in-memory database)", async () => {
    const memory = openDatabase({ url: "file::memory:" });
    try {
      await memory.$client.execute("CREATE TABLE t (a INTEGER, b TEXT)");
      await memory.$client.execute("INSERT INTO t VALUES (7, 'seven')");
      expect(await lookupFirstRow(memory, "SELECT a, b FROM t WHERE a = ?", [7])).toEqual([7, "seven"]);
      expect(await lookupFirstRow(memory, "SELECT a, b FROM t WHERE a = ?", [8])).toBeUndefined();
    } finally {
      memory.$client.close();
    }
  });
});
