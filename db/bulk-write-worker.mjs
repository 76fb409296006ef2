// @ts-check
/**
 * The writer thread of db/bulk-write.ts: runs one list of write steps at a
 * time in one transaction on an embedded database, all or nothing, on a
 * connection of its own, while the server's main thread goes on answering
 * requests. Plain JavaScript, so Node can start it as it is in every mode
 * (development, production, tests, benchmarks).
 *
 * Message in:  { id, file, steps }, steps as WriteStep of db/bulk-write.ts.
 * Message out: { id, ok: true } or { id, ok: false, message, code }.
 */
import { parentPort } from "node:worker_threads";

import Libsql from "libsql";

/** At most this many rows per INSERT, and at most ~8,000 values (SQLite allows 32,766). */
const MAX_ROWS_PER_STATEMENT = 512;

/** @type {Map<string, InstanceType<typeof Libsql>>} */
const connections = new Map();

/** @param {string} file */
function connectionTo(file) {
  let connection = connections.get(file);
  if (!connection) {
    connection = new Libsql(file, { timeout: 5_000 });
    connections.set(file, connection);
  }
  return connection;
}

/**
 * Values as the client would send them: dates as milliseconds, booleans as
 * 1/0, byte arrays as Buffers; the rest as they are.
 * @param {unknown[]} args
 */
function checked(args) {
  for (let i = 0; i < args.length; i++) {
    const value = args[i];
    if (typeof value === "number") {
      if (!Number.isFinite(value))
        throw new RangeError("Only finite numbers (not Infinity or NaN) can be written");
    } else if (value instanceof Date) args[i] = value.getTime();
    else if (typeof value === "boolean") args[i] = value ? 1 : 0;
    else if (value instanceof Uint8Array && !Buffer.isBuffer(value))
      args[i] = Buffer.from(value.buffer, value.byteOffset, value.byteLength);
    else if (value === undefined) throw new RangeError("A value to write is undefined");
  }
  return args;
}

/**
 * Multi-row INSERTs on statements prepared once per table.
 * @param {InstanceType<typeof Libsql>} connection
 * @param {{ table: string; columns: string[]; rows: unknown[][] }} step
 */
function insertPrepared(connection, { table, columns, rows }) {
  const width = columns.length;
  const perStatement = Math.max(1, Math.min(MAX_ROWS_PER_STATEMENT, Math.floor(8_000 / width)));
  const tuple = `(${columns.map(() => "?").join(",")})`;
  /** @param {number} n */
  const sqlFor = (n) =>
    `INSERT INTO ${table} (${columns.join(",")}) VALUES ${Array.from({ length: n }, () => tuple).join(",")}`;
  let full = null;
  for (let start = 0; start < rows.length; start += perStatement) {
    const end = Math.min(rows.length, start + perStatement);
    const args = new Array((end - start) * width);
    let k = 0;
    for (let i = start; i < end; i++) {
      const row = rows[i];
      if (row.length !== width)
        throw new RangeError(`A row for ${table} has ${row.length} values, not ${width}`);
      for (let c = 0; c < width; c++) args[k++] = row[c];
    }
    const statement =
      end - start === perStatement
        ? (full ??= connection.prepare(sqlFor(perStatement)))
        : connection.prepare(sqlFor(end - start));
    statement.run(checked(args));
  }
}

parentPort?.on("message", ({ id, file, steps }) => {
  try {
    const connection = connectionTo(file);
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
    parentPort?.postMessage({ id, ok: true });
  } catch (error) {
    parentPort?.postMessage({
      id,
      ok: false,
      message: error instanceof Error ? error.message : String(error),
      code: error && typeof error === "object" && "code" in error ? String(error.code) : undefined,
    });
  }
});
