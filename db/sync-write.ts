/**
 * Writing steps (statements, and multi-row inserts of many rows) on a
 * connection of this thread's own to an embedded database, synchronously,
 * on statements prepared once per table. Shared by writeAllOrNothing
 * (db/bulk-write.ts) on the server's thread and by the helper thread that
 * writes the full recompute's result (lib/series/k-fit-helper.ts), so it
 * imports nothing that is only for the server's bundle.
 */
import type { InValue } from "@libsql/client";
import type Libsql from "libsql";

export type Connection = InstanceType<typeof Libsql>;

export type WriteStep =
  | { sql: string; args?: InValue[] }
  | { table: string; columns: readonly string[]; rows: ReadonlyArray<ReadonlyArray<InValue>> }
  | ColumnarRows;

/**
 * Rows given column by column: row i is (values[0][i], values[1][i], …).
 * Typed arrays pass to a helper thread as one copy of their bytes, where
 * rows as arrays are copied value by value. In a Float64Array column, NaN
 * stands for NULL.
 */
export type ColumnarRows = {
  table: string;
  columns: readonly string[];
  values: ReadonlyArray<ArrayLike<InValue>>;
  length: number;
};

/** Runs one step inside the transaction the caller holds open. */
export function runStep(connection: Connection, step: WriteStep): void {
  if ("sql" in step) connection.prepare(step.sql).run(checked(step.args ?? []));
  else insertPrepared(connection, step);
}

/** Row r of a table step, whichever way its rows are given. */
export function rowOfStep(step: Exclude<WriteStep, { sql: string }>, r: number): InValue[] {
  if ("rows" in step) return [...step.rows[r]!];
  return step.values.map((column) => valueAt(column, r));
}

/** The number of rows of a table step; throws when its columns do not hold that many. */
export function rowCountOfStep(step: Exclude<WriteStep, { sql: string }>): number {
  if ("rows" in step) return step.rows.length;
  const { table, columns, values, length } = step;
  if (values.length !== columns.length || values.some((column) => column.length < length))
    throw new RangeError(`The columns for ${table} do not hold ${length} rows of ${columns.length} values`);
  return length;
}

function valueAt(column: ArrayLike<InValue>, r: number): InValue {
  const value = column[r]!;
  return column instanceof Float64Array && Number.isNaN(value) ? null : value;
}

/** Runs the steps in one write transaction: all of them or, on any error, none. */
export function runStepsAllOrNothing(connection: Connection, steps: readonly WriteStep[]): void {
  connection.exec("BEGIN IMMEDIATE");
  try {
    for (const step of steps) runStep(connection, step);
    connection.exec("COMMIT");
  } catch (error) {
    if (connection.inTransaction) connection.exec("ROLLBACK");
    throw error;
  }
}

/** At most this many rows per INSERT, and at most ~8,000 values (SQLite allows 32,766). */
const MAX_ROWS_PER_STATEMENT = 512;

function insertPrepared(connection: Connection, step: Exclude<WriteStep, { sql: string }>): void {
  const { table, columns } = step;
  const width = columns.length;
  const count = rowCountOfStep(step);
  const perStatement = Math.max(1, Math.min(MAX_ROWS_PER_STATEMENT, Math.floor(8_000 / width)));
  const tuple = `(${columns.map(() => "?").join(",")})`;
  const sqlFor = (n: number) =>
    `INSERT INTO ${table} (${columns.join(",")}) VALUES ${Array.from({ length: n }, () => tuple).join(",")}`;
  let full: ReturnType<Connection["prepare"]> | null = null;
  for (let start = 0; start < count; start += perStatement) {
    const end = Math.min(count, start + perStatement);
    const args = new Array<InValue>((end - start) * width);
    if ("rows" in step) {
      let k = 0;
      for (let i = start; i < end; i++) {
        const row = step.rows[i]!;
        if (row.length !== width)
          throw new RangeError(`A row for ${table} has ${row.length} values, not ${width}`);
        for (let c = 0; c < width; c++) args[k++] = row[c]!;
      }
    } else {
      // Column by column into the statement's arguments.
      for (let c = 0; c < width; c++) {
        const column = step.values[c]!;
        if (column instanceof Float64Array) {
          for (let i = start, k = c; i < end; i++, k += width) {
            const value = column[i] as number;
            args[k] = Number.isNaN(value) ? null : value;
          }
        } else for (let i = start, k = c; i < end; i++, k += width) args[k] = column[i]!;
      }
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
