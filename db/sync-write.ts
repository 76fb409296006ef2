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
  if ("sql" in step) statementFor(connection, step.sql, () => step.sql).run(checked(step.args ?? []));
  else insertPrepared(connection, step);
}

type Statement = ReturnType<Connection["prepare"]>;

/** Statements kept per connection; the oldest goes beyond this many. */
const MAX_KEPT_STATEMENTS = 64;
const keptStatements = new WeakMap<Connection, Map<string, Statement>>();

/**
 * The connection's statement for `key`, prepared from makeSql() the first
 * time only. Preparing an insert of 512 rows (thousands of placeholders)
 * takes about a millisecond, and a full recompute runs the same few
 * statements dozens of times, recompute after recompute.
 */
function statementFor(connection: Connection, key: string, makeSql: () => string): Statement {
  let kept = keptStatements.get(connection);
  if (!kept) {
    kept = new Map();
    keptStatements.set(connection, kept);
  }
  let statement = kept.get(key);
  if (statement) return statement;
  statement = connection.prepare(makeSql());
  if (kept.size >= MAX_KEPT_STATEMENTS) kept.delete(kept.keys().next().value!);
  kept.set(key, statement);
  return statement;
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

/**
 * Inserts a table step's rows, up to MAX_ROWS_PER_STATEMENT per statement.
 * A column holding one value in all of a statement's rows (the method of
 * every k, the hemisphere of a run of daily rows) is bound once, as a
 * numbered parameter every row refers to: binding is most of what an
 * insert costs here (each value crosses from JavaScript one at a time), and
 * strings cost the most.
 */
function insertPrepared(connection: Connection, step: Exclude<WriteStep, { sql: string }>): void {
  const { table, columns } = step;
  const width = columns.length;
  const count = rowCountOfStep(step);
  const perStatement = Math.max(1, Math.min(MAX_ROWS_PER_STATEMENT, Math.floor(8_000 / width)));
  const chunk: InValue[][] = columns.map(() => []);
  const same = new Array<boolean>(width);
  for (let start = 0; start < count; start += perStatement) {
    const end = Math.min(count, start + perStatement);
    const rows = end - start;
    // The chunk column by column, with the values as they are bound.
    if ("rows" in step) {
      for (let i = start; i < end; i++) {
        const row = step.rows[i]!;
        if (row.length !== width)
          throw new RangeError(`A row for ${table} has ${row.length} values, not ${width}`);
      }
      for (let c = 0; c < width; c++) {
        const values = chunk[c]!;
        values.length = rows;
        for (let i = start; i < end; i++) values[i - start] = step.rows[i]![c]!;
      }
    } else {
      for (let c = 0; c < width; c++) {
        const column = step.values[c]!;
        const values = chunk[c]!;
        values.length = rows;
        if (column instanceof Float64Array) {
          for (let i = start; i < end; i++) {
            const value = column[i] as number;
            values[i - start] = Number.isNaN(value) ? null : value;
          }
        } else for (let i = start; i < end; i++) values[i - start] = column[i]!;
      }
    }
    let shared = 0;
    for (let c = 0; c < width; c++) {
      const values = chunk[c]!;
      const first = values[0];
      let one = rows > 1;
      for (let i = 1; one && i < rows; i++) one = Object.is(values[i], first);
      same[c] = one;
      if (one) shared++;
    }
    const args = new Array<InValue>(shared + rows * (width - shared));
    let k = 0;
    for (let c = 0; c < width; c++) if (same[c]) args[k++] = chunk[c]![0]!;
    for (let i = 0; i < rows; i++) for (let c = 0; c < width; c++) if (!same[c]) args[k++] = chunk[c]![i]!;
    const key = `${table}(${columns.join(",")})×${rows}:${same.map((one) => (one ? 1 : 0)).join("")}`;
    statementFor(connection, key, () => insertSql({ table, columns, rows, same })).run(checked(args));
  }
}

/**
 * INSERT of `rows` rows binding first one value for each column the rows
 * share (`same`), then each row's own values, row after row. The shared
 * columns come first in every row, as ?1, ?2…; the plain ? after them then
 * number on from there. (Numbering every parameter would make SQLite look
 * each one up among all the others while preparing: 20 ms for 512 rows.)
 */
function insertSql({
  table,
  columns,
  rows,
  same,
}: {
  table: string;
  columns: readonly string[];
  rows: number;
  same: readonly boolean[];
}): string {
  const shared = columns.filter((_, c) => same[c]);
  const own = columns.filter((_, c) => !same[c]);
  const tuple = `(${[...shared.map((_, j) => `?${j + 1}`), ...own.map(() => "?")].join(",")})`;
  return `INSERT INTO ${table} (${[...shared, ...own].join(",")}) VALUES ${Array.from({ length: rows }, () => tuple).join(",")}`;
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
