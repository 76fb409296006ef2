/**
 * writeAllOrNothing (db/bulk-write.ts): both of its paths (its own connection
 * on an embedded database, a client transaction elsewhere) store every row
 * or none, and refuse what the client refuses; so does a write the helper
 * thread makes (lib/series/k-fit-helper.ts), sent in parts.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";

import { writeAllOrNothing, type WriteStep } from "@/db/bulk-write";
import { embeddedFileOf, getDb, openDatabase, type Database } from "@/db/client";
import { openResultWriter } from "@/db/queries/recompute";
import {
  isKFitHelperRunning,
  startHelperWrite,
  stopKFitHelper,
  whenHelperIdle,
  whenKFitHelperReady,
} from "@/lib/series/k-fit-helper";

const TABLE = "CREATE TABLE bulk_test (n INTEGER PRIMARY KEY, label TEXT NOT NULL, value REAL)";
let memory: Database;

beforeAll(async () => {
  await getDb().$client.execute(TABLE);
  memory = openDatabase({ url: "file::memory:" });
  await memory.$client.execute(TABLE);
});

afterAll(() => memory.$client.close());

const rowsOf = (count: number, from = 0) =>
  Array.from({ length: count }, (_, i) => [from + i, `row ${from + i}`, i % 7 === 0 ? null : (from + i) / 4]);

describe.each([
  ["an embedded file (its own connection)", () => getDb()],
  ["an in-memory database (a client transaction)", () => memory],
])("writeAllOrNothing on %s", (_name, databaseOf) => {
  const count = async () =>
    Number((await databaseOf().$client.execute("SELECT count(*) AS n FROM bulk_test")).rows[0]!.n);

  it("replaces a table's rows, more than one statement's worth, in one transaction", async () => {
    const db = databaseOf();
    // 2,000 rows: several full statements and a short last one.
    const steps: WriteStep[] = [
      { sql: "DELETE FROM bulk_test" },
      { table: "bulk_test", columns: ["n", "label", "value"], rows: rowsOf(2_000) },
      { sql: "INSERT INTO bulk_test (n, label) VALUES (?, ?)", args: [99_999, "last"] },
    ];
    await writeAllOrNothing(db, steps);
    expect(await count()).toBe(2_001);
    const sample = await db.$client.execute(
      "SELECT n, label, value FROM bulk_test WHERE n IN (0, 1, 1999) ORDER BY n",
    );
    expect(sample.rows.map((r) => [r.n, r.label, r.value])).toEqual([
      [0, "row 0", null],
      [1, "row 1", 0.25],
      [1999, "row 1999", 499.75],
    ]);
    await writeAllOrNothing(db, [
      { sql: "DELETE FROM bulk_test" },
      { table: "bulk_test", columns: ["n", "label", "value"], rows: rowsOf(3) },
    ]);
    expect(await count()).toBe(3);
  });

  it("takes rows column by column, NaN in a Float64Array as NULL", async () => {
    const db = databaseOf();
    await writeAllOrNothing(db, [
      { sql: "DELETE FROM bulk_test" },
      {
        table: "bulk_test",
        columns: ["n", "label", "value"],
        length: 1_200,
        values: [
          Int32Array.from({ length: 1_200 }, (_, i) => i),
          Array.from({ length: 1_200 }, (_, i) => `row ${i}`),
          Float64Array.from({ length: 1_200 }, (_, i) => (i % 7 === 0 ? Number.NaN : i / 4)),
        ],
      },
    ]);
    const stored = await db.$client.execute("SELECT n, label, value FROM bulk_test ORDER BY n");
    expect(stored.rows.map((r) => [r.n, r.label, r.value])).toEqual(
      rowsOf(1_200).map(([n, label, value]) => [n, label, value === null ? null : Number(n) / 4]),
    );
    // Columns shorter than the rows asked for are refused, and nothing is stored.
    await expect(
      writeAllOrNothing(db, [
        { sql: "DELETE FROM bulk_test" },
        {
          table: "bulk_test",
          columns: ["n", "label", "value"],
          length: 3,
          values: [
            [1, 2, 3],
            ["a", "b"],
            [1, 2, 3],
          ],
        },
      ]),
    ).rejects.toThrow(/do not hold 3 rows/);
    expect(await count()).toBe(1_200);
    await writeAllOrNothing(db, [
      { sql: "DELETE FROM bulk_test" },
      { table: "bulk_test", columns: ["n", "label", "value"], rows: rowsOf(3) },
    ]);
  });

  it("stores every row as given when some statements' rows share a column's value", async () => {
    const db = databaseOf();
    // Labels: the same for rows 0–699 (one full statement of 512 rows and
    // part of the next), then each its own. Values: all NULL up to 1,023,
    // then 2.5 up to 1,535, then each its own. Whole statements of shared
    // values, mixed ones, and a short last one.
    const length = 1_800;
    const label = (i: number) => (i < 700 ? "shared" : `row ${i}`);
    const value = (i: number) => (i < 1_024 ? null : i < 1_536 ? 2.5 : i / 8);
    const expected = Array.from({ length }, (_, i): [number, string, number | null] => [
      i,
      label(i),
      value(i),
    ]);
    // Twice each way, the second time with other numbers through the same statements.
    for (const offset of [0, 10_000]) {
      for (const shape of ["rows", "columns"] as const) {
        const shifted = expected.map(([n, l, v]): [number, string, number | null] => [n + offset, l, v]);
        await writeAllOrNothing(db, [
          { sql: "DELETE FROM bulk_test" },
          shape === "rows"
            ? { table: "bulk_test", columns: ["n", "label", "value"], rows: shifted }
            : {
                table: "bulk_test",
                columns: ["n", "label", "value"],
                length,
                values: [
                  Int32Array.from(shifted, ([n]) => n),
                  shifted.map(([, l]) => l),
                  Float64Array.from(shifted, ([, , v]) => v ?? Number.NaN),
                ],
              },
        ]);
        const stored = await db.$client.execute("SELECT n, label, value FROM bulk_test ORDER BY n");
        expect(
          stored.rows.map((r) => [r.n, r.label, r.value]),
          `${shape}, from ${offset}`,
        ).toEqual(shifted);
      }
    }
    await writeAllOrNothing(db, [
      { sql: "DELETE FROM bulk_test" },
      { table: "bulk_test", columns: ["n", "label", "value"], rows: rowsOf(3) },
    ]);
  });

  it("stores nothing when any step fails, and says why", async () => {
    const db = databaseOf();
    const failing: Array<[string, WriteStep[]]> = [
      ["NOT NULL", [{ table: "bulk_test", columns: ["n", "label", "value"], rows: [[10, null, 1]] }]],
      [
        "UNIQUE",
        [
          {
            table: "bulk_test",
            columns: ["n", "label", "value"],
            rows: rowsOf(600, 1_000).concat([[1_000, "again", 1]]),
          },
        ],
      ],
      ["finite", [{ table: "bulk_test", columns: ["n", "label", "value"], rows: [[10, "x", Number.NaN]] }]],
      ["no such table", [{ sql: "DELETE FROM no_such_table" }]],
    ];
    for (const [reason, steps] of failing) {
      await expect(
        writeAllOrNothing(db, [{ sql: "DELETE FROM bulk_test" }, ...steps]),
        reason,
      ).rejects.toThrow(new RegExp(reason, "i"));
      // The DELETE before the failing step was rolled back too.
      expect(await count(), reason).toBe(3);
    }
  });

  it("stores blobs (the count packs) byte for byte, empty ones too", async () => {
    const db = databaseOf();
    await db.$client.execute(
      "CREATE TABLE IF NOT EXISTS bulk_blobs (n INTEGER PRIMARY KEY, bytes BLOB NOT NULL)",
    );
    const bytes = Uint8Array.from({ length: 1_000 }, (_, i) => (i * 37) % 256);
    // A Buffer over part of a larger one, as the recompute hands its packs over.
    const offset = Buffer.from(Uint8Array.from([9, 9, ...bytes, 9]).buffer, 2, bytes.length);
    await writeAllOrNothing(db, [
      { sql: "DELETE FROM bulk_blobs" },
      {
        table: "bulk_blobs",
        columns: ["n", "bytes"],
        rows: [
          [1, offset],
          [2, Buffer.alloc(0)],
        ],
      },
    ]);
    const stored = await db.$client.execute("SELECT n, bytes FROM bulk_blobs ORDER BY n");
    expect(stored.rows.map((r) => new Uint8Array(r.bytes as ArrayBuffer))).toEqual([
      bytes,
      new Uint8Array(0),
    ]);
  });
});

describe("a write made on the helper thread (startHelperWrite)", () => {
  const db = () => getDb();
  const file = () => embeddedFileOf(db())!;
  const labels = async () =>
    (await db().$client.execute("SELECT label FROM bulk_test ORDER BY n")).rows.map((r) => r.label);
  const start = async () => {
    expect(await whenKFitHelperReady()).toBe(true);
    const write = startHelperWrite({ file: file() });
    expect(write).not.toBeNull();
    return write!;
  };

  beforeAll(async () => {
    await writeAllOrNothing(db(), [
      { sql: "DELETE FROM bulk_test" },
      { table: "bulk_test", columns: ["n", "label", "value"], rows: [[1, "before", 1]] },
    ]);
  });

  it("stores every part, sent one by one, once committed", async () => {
    const write = await start();
    write.send([{ sql: "DELETE FROM bulk_test" }]);
    write.send([{ table: "bulk_test", columns: ["n", "label", "value"], rows: rowsOf(700) }]);
    // Readers see the old rows until the commit.
    expect(await labels()).toEqual(["before"]);
    await write.finish("commit", [
      { table: "bulk_test", columns: ["n", "label", "value"], rows: rowsOf(300, 700) },
    ]);
    expect((await labels()).length).toBe(1_000);
    expect((await labels())[999]).toBe("row 999");
    // Once answered, the helper copies the log into the database file.
    const { lastCheckpoint } = await whenHelperIdle();
    expect(lastCheckpoint?.logPages).toBeGreaterThan(0);
    expect(lastCheckpoint?.checkpointedPages).toBe(lastCheckpoint?.logPages);
  });

  it("stores nothing when a part fails, says why, and takes the next write", async () => {
    const write = await start();
    write.send([{ sql: "DELETE FROM bulk_test" }]);
    write.send([{ table: "bulk_test", columns: ["n", "label", "value"], rows: [[5, null, 1]] }]);
    // Parts after the failure are not run.
    write.send([{ table: "bulk_test", columns: ["n", "label", "value"], rows: [[6, "six", 1]] }]);
    await expect(write.finish("commit")).rejects.toThrow(/NOT NULL/);
    expect((await labels()).length).toBe(1_000);

    const next = await start();
    next.send([{ sql: "DELETE FROM bulk_test WHERE n >= 10" }]);
    await next.finish("commit");
    expect(await labels()).toEqual(rowsOf(10).map((r) => r[1]));
  });

  it("stores nothing when abandoned, and lets this thread write afterwards", async () => {
    const write = await start();
    write.send([{ sql: "DELETE FROM bulk_test" }]);
    await write.finish("abort");
    expect((await labels()).length).toBe(10);
    await writeAllOrNothing(db(), [{ sql: "DELETE FROM bulk_test WHERE n >= 5" }]);
    expect((await labels()).length).toBe(5);
  });

  it("lets this process read, and makes its writes wait, while the helper writes a recompute's result", async () => {
    expect(await whenKFitHelperReady()).toBe(true);
    const before = await labels();
    const writer = await openResultWriter({ threads: 2 });
    expect(writer.streaming).toBe(true);
    writer.add([{ sql: "DELETE FROM bulk_test" }]);
    writer.add([{ table: "bulk_test", columns: ["n", "label", "value"], rows: rowsOf(50) }]);
    // The helper has run both parts: its transaction holds the write lock.
    await whenHelperIdle();
    const done: string[] = [];
    const clientWrite = db()
      .$client.execute({ sql: "INSERT INTO bulk_test (n, label) VALUES (?, ?)", args: [5_000, "waited"] })
      .then(() => done.push("client"));
    const bulkWrite = writeAllOrNothing(db(), [
      { sql: "INSERT INTO bulk_test (n, label) VALUES (?, ?)", args: [5_001, "waited too"] },
    ]).then(() => done.push("bulk"));
    // This thread goes on (a write waiting for the lock here would stop it)…
    await new Promise((resolve) => setTimeout(resolve, 50));
    expect(done).toEqual([]);
    // …and reads the last committed rows.
    expect(await labels()).toEqual(before);
    expect(await writer.commit([])).toBe("helper");
    await Promise.all([clientWrite, bulkWrite]);
    expect(await labels()).toEqual([...rowsOf(50).map((r) => r[1]), "waited", "waited too"]);
  });

  // Last: the helper does not come back in this process.
  it("writes the recompute's result on this thread when the helper stops during its write", async () => {
    expect(await whenKFitHelperReady()).toBe(true);
    const writer = await openResultWriter({ threads: 2 });
    expect(writer.streaming).toBe(true);
    writer.add([{ sql: "DELETE FROM bulk_test" }]);
    writer.add([{ table: "bulk_test", columns: ["n", "label", "value"], rows: rowsOf(700) }]);
    // The helper has run both parts: its transaction holds the write lock.
    await whenHelperIdle();
    stopKFitHelper("Stopped by the test");
    expect(isKFitHelperRunning()).toBe(false);
    const writtenOn = await writer.commit([
      { table: "bulk_test", columns: ["n", "label", "value"], rows: rowsOf(300, 700) },
    ]);
    expect(writtenOn).toBe("server");
    expect(await labels()).toEqual(rowsOf(1_000).map((r) => r[1]));
    // From now on everything is written here.
    expect((await openResultWriter({ threads: 2 })).streaming).toBe(false);
  });
});
