import "server-only";

import { mkdirSync } from "node:fs";
import path from "node:path";

import {
  createClient,
  type Client,
  type InStatement,
  type InValue,
  type ResultSet,
  type Transaction,
  type TransactionMode,
} from "@libsql/client";
import { drizzle, type LibSQLDatabase } from "drizzle-orm/libsql";
import Libsql from "libsql";

import { getEnv } from "@/lib/env";

import * as schema from "./schema";

export type Database = LibSQLDatabase<typeof schema> & { $client: Client };

type Cache = { db?: Database; url?: string };
// Next's dev server reloads modules on every change; keeping the client on
// globalThis stops each reload from opening another pool of connections.
const cache = globalThis as unknown as { __heliotallyDb?: Cache };

/** Opens (or reuses) the database named by DATABASE_URL. */
export function getDb(): Database {
  const { DATABASE_URL } = getEnv();
  const slot = (cache.__heliotallyDb ??= {});
  if (slot.db && slot.url === DATABASE_URL) return slot.db;
  slot.db?.$client.close();
  slot.db = openDatabase({ url: DATABASE_URL });
  slot.url = DATABASE_URL;
  return slot.db;
}

export function openDatabase({ url }: { url: string }): Database {
  const env = getEnv();
  const isFile = url.startsWith("file:");
  if (isFile) ensureParentFolder(url);
  const client = createClient({
    url,
    authToken: env.DATABASE_AUTH_TOKEN,
    // An embedded replica: reads from the local file, writes go to the server.
    syncUrl: isFile ? env.DATABASE_SYNC_URL : undefined,
    syncInterval: isFile ? env.DATABASE_SYNC_INTERVAL_S : undefined,
    // Wait for a writer in another process (the mail sink, a seed) instead of
    // failing at once with SQLITE_BUSY.
    timeout: 5_000,
  });
  const file = isFile ? filePathOf(url) : null;
  if (file && !file.includes(":memory:") && !url.includes("mode=memory") && !env.DATABASE_SYNC_URL)
    attachLookups({ client, file });
  return drizzle(client, { schema });
}

// ---------------------------------------------------------------------------
// One-row lookups every request makes (who is calling, which series
// revision is current). Through the client each costs about 36 µs (it
// prepares the statement, asks for its column names and converts every
// integer through BigInt); a statement prepared once on a connection of its
// own costs about 8 µs (measured in tests/bench/series.bench.ts). Only for
// an embedded database: with a libSQL server or an embedded replica the
// lookups go through the client as everything else does.
// ---------------------------------------------------------------------------

type Connection = InstanceType<typeof Libsql>;
type Lookups = {
  file: string;
  open: { connection: Connection; statements: Map<string, ReturnType<Connection["prepare"]>> } | null;
};
const lookups = new WeakMap<Client, Lookups>();

function attachLookups({ client, file }: { client: Client; file: string }): void {
  const own: Lookups = { file, open: null };
  lookups.set(client, own);
  const close = client.close.bind(client);
  client.close = () => {
    own.open?.connection.close();
    own.open = null;
    close();
  };
  gateWrites(client);
}

// ---------------------------------------------------------------------------
// The write gate. On an embedded database a statement waits for another
// connection's write lock synchronously, on the thread that runs it. While
// the k-fit helper thread writes a full recompute's result, this thread
// still sends it the parts: a write here would stop this thread until the
// busy timeout, and with it the parts the helper waits for. So while a
// write is held (holdWrites), every write through the client, and every
// writeAllOrNothing, first waits, without blocking, until it is let go;
// reads go on (the log lets them read the last committed state), and other
// requests get their turns during the recompute.
// ---------------------------------------------------------------------------

let writesHeld: { released: Promise<void>; release: () => void } | null = null;

/**
 * Makes writes through the client wait until the returned function is
 * called (once is enough; more calls do nothing). One hold at a time: a
 * second waits for the first.
 */
export function holdWrites(): Promise<() => void> {
  return afterWritesOpen(() => {
    let release!: () => void;
    const released = new Promise<void>((resolve) => (release = resolve));
    const hold = { released, release: () => undefined };
    hold.release = () => {
      if (writesHeld === hold) writesHeld = null;
      release();
    };
    writesHeld = hold;
    return hold.release;
  });
}

/**
 * Runs `write` once no write is held. It is called in the same synchronous
 * run as the last check, so nothing can take a hold in between (a write
 * that started after a hold was taken could wait for the helper's lock on
 * this thread); at once, without a turn, when nothing is held.
 */
export async function afterWritesOpen<T>(write: () => T | Promise<T>): Promise<T> {
  while (writesHeld) await writesHeld.released;
  return write();
}

/** Statements that only read: they need no gate. */
const READ_ONLY_SQL = /^\s*(select|explain)\b/i;

function isReadOnly(statement: InStatement): boolean {
  const sql = typeof statement === "string" ? statement : statement.sql;
  return READ_ONLY_SQL.test(sql);
}

/** Routes the client's writes through the gate (see holdWrites). */
function gateWrites(client: Client): void {
  const execute = client.execute.bind(client) as (statement: InStatement) => Promise<ResultSet>;
  const batch = client.batch.bind(client);
  const transaction = client.transaction.bind(client);
  const executeMultiple = client.executeMultiple.bind(client);
  const migrate = client.migrate.bind(client);
  // Overloads cannot be restated one by one here; the calls pass through unchanged.
  Object.assign(client, {
    execute: (statement: InStatement) =>
      isReadOnly(statement) ? execute(statement) : afterWritesOpen(() => execute(statement)),
    // "write" takes the write lock at BEGIN, whatever the statements.
    batch: (statements: InStatement[], mode?: TransactionMode) =>
      mode !== "write" && statements.every(isReadOnly)
        ? batch(statements, mode)
        : afterWritesOpen(() => batch(statements, mode)),
    transaction: (mode?: TransactionMode) =>
      mode === "read" ? transaction(mode) : afterWritesOpen(() => transaction(mode)),
    executeMultiple: (sql: string) => afterWritesOpen(() => executeMultiple(sql)),
    migrate: (statements: InStatement[]) => afterWritesOpen(() => migrate(statements)),
  });
}

/** Runs `work` in one write transaction of the client: committed if it returns, rolled back if it throws. */
export async function inWriteTransaction<T>(db: Database, work: (tx: Transaction) => Promise<T>): Promise<T> {
  const tx = await db.$client.transaction("write");
  try {
    const result = await work(tx);
    await tx.commit();
    return result;
  } catch (error) {
    await tx.rollback();
    throw error;
  } finally {
    tx.close();
  }
}

/**
 * The connection of this process's own to an embedded database (opened once,
 * shared by the lookups and the bulk writes), or null for a libSQL server,
 * an embedded replica or a database in memory. Used only synchronously, so
 * one user never finds it in the middle of another's statement or
 * transaction.
 */
export function ownConnection(db: Database): Connection | null {
  const own = lookups.get(db.$client);
  if (!own) return null;
  if (!own.open) {
    const connection = new Libsql(own.file, { timeout: 5_000 });
    // The usual pairing with write-ahead logging (the database is in WAL
    // mode, db/prepare.ts): a commit appends to the log without waiting for
    // the disk; the log is synced at checkpoints. A crash of the process
    // loses nothing; a power cut may lose the last commits, never the
    // database's consistency. Measured: the full recompute's commit went
    // from about 10 ms to about 1.5 ms.
    connection.exec("PRAGMA synchronous = NORMAL");
    own.open = { connection, statements: new Map() };
  }
  return own.open.connection;
}

/** The file of an embedded database the process has its own connection to (see ownConnection), else null. */
export function embeddedFileOf(db: Database): string | null {
  return lookups.get(db.$client)?.file ?? null;
}

/**
 * The first row of a read-only query, as an array of column values (integers
 * as numbers), or undefined when there is none. For the few lookups on every
 * request's path; everything else uses Drizzle or the client.
 */
export async function lookupFirstRow(
  db: Database,
  sql: string,
  args: InValue[],
): Promise<unknown[] | undefined> {
  const own = lookups.get(db.$client);
  if (!own) {
    const result = await db.$client.execute({ sql, args });
    const row = result.rows[0];
    return row ? result.columns.map((_, i) => row[i]) : undefined;
  }
  const connection = ownConnection(db)!;
  let statement = own.open!.statements.get(sql);
  if (!statement) {
    statement = connection.prepare(sql).raw(true);
    own.open!.statements.set(sql, statement);
  }
  return statement.get(args) as unknown[] | undefined;
}

function filePathOf(url: string): string {
  return path.resolve(/*turbopackIgnore: true*/ url.replace(/^file:(\/\/)?/, "").split("?")[0] ?? "");
}

function ensureParentFolder(url: string): void {
  const file = url.replace(/^file:(\/\/)?/, "").split("?")[0] ?? "";
  if (!file || file === ":memory:") return;
  mkdirSync(path.dirname(path.resolve(/*turbopackIgnore: true*/ file)), { recursive: true });
}
