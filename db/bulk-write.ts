import "server-only";

import type { InValue } from "@libsql/client";
import type Libsql from "libsql";

import { inWriteTransaction, ownConnection, type Database } from "./client";
import { insertRows } from "./queries/series";

export type WriteStep =
  | { sql: string; args?: InValue[] }
  | { table: string; columns: readonly string[]; rows: ReadonlyArray<ReadonlyArray<InValue>> };

/**
 * Runs the steps (statements, and multi-row inserts of many rows) in one
 * write transaction: all of them or, on any error, none.
 *
 * On an embedded database it runs them synchronously on the process's own
 * connection (ownConnection, db/client.ts), on statements prepared once per
 * table: tens of thousands of rows then take about half the time they take
 * through the client, which prepares every statement again and converts
 * every value on the way (measured in tests/bench/series.bench.ts). The
 * event loop waits for the whole write: the full recompute of a million
 * counts writes about 35,000 rows and holds it for 120–180 ms, the
 * longest stall of the recompute. In return no other request of this
 * process can take its turn while the write lock is held: a second writer
 * here would wait for the lock on this same thread, which would deadlock
 * until its busy timeout.
 * With a libSQL server or an embedded replica, the steps go through a
 * client transaction.
 */
export async function writeAllOrNothing(db: Database, steps: readonly WriteStep[]): Promise<void> {
  const connection = ownConnection(db);
  if (!connection) {
    await writeThroughClient(db, steps);
    return;
  }
  connection.exec("BEGIN IMMEDIATE");
  try {
    for (const step of steps) {
      if ("sql" in step) connection.prepare(step.sql).run(checked(step.args ?? []));
      else insertPrepared(connection, step);
    }
    connection.exec("COMMIT");
  } catch (error) {
    if (connection.inTransaction) connection.exec("ROLLBACK");
    throw error;
  }
}

async function writeThroughClient(db: Database, steps: readonly WriteStep[]): Promise<void> {
  await inWriteTransaction(db, async (tx) => {
    for (const step of steps) {
      if ("sql" in step) await tx.execute({ sql: step.sql, args: step.args ?? [] });
      else await insertRows({ tx, ...step });
    }
  });
}

/** At most this many rows per INSERT, and at most ~8,000 values (SQLite allows 32,766). */
const MAX_ROWS_PER_STATEMENT = 512;

function insertPrepared(
  connection: InstanceType<typeof Libsql>,
  { table, columns, rows }: Extract<WriteStep, { table: string }>,
): void {
  const width = columns.length;
  const perStatement = Math.max(1, Math.min(MAX_ROWS_PER_STATEMENT, Math.floor(8_000 / width)));
  const tuple = `(${columns.map(() => "?").join(",")})`;
  const sqlFor = (n: number) =>
    `INSERT INTO ${table} (${columns.join(",")}) VALUES ${Array.from({ length: n }, () => tuple).join(",")}`;
  let full: ReturnType<typeof connection.prepare> | null = null;
  for (let start = 0; start < rows.length; start += perStatement) {
    const end = Math.min(rows.length, start + perStatement);
    const args = new Array<InValue>((end - start) * width);
    let k = 0;
    for (let i = start; i < end; i++) {
      const row = rows[i]!;
      if (row.length !== width)
        throw new RangeError(`A row for ${table} has ${row.length} values, not ${width}`);
      for (let c = 0; c < width; c++) args[k++] = row[c]!;
    }
    const statement =
      end - start === perStatement
        ? (full ??= connection.prepare(sqlFor(perStatement)))
        : connection.prepare(sqlFor(end - start));
    statement.run(checked(args));
  }
}

/** Values as the client would send them: dates as milliseconds, booleans as 1/0; the rest as they are. */
function checked(args: InValue[]): InValue[] {
  for (let i = 0; i < args.length; i++) {
    const value = args[i];
    if (typeof value === "number") {
      if (!Number.isFinite(value))
        throw new RangeError("Only finite numbers (not Infinity or NaN) can be written");
    } else if (value instanceof Date) args[i] = value.getTime();
    else if (typeof value === "boolean") args[i] = value ? 1 : 0;
    else if (value === undefined) throw new RangeError("A value to write is undefined");
  }
  return args;
}
