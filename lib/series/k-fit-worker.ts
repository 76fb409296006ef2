/**
 * The k-fit helper thread (started by lib/series/k-fit-helper.ts): takes
 * periods one at a time from those it is sent, as the server's own thread
 * does, fits them with the same code, and sends the results back. The
 * counts arrive in shared memory, so nothing is copied but the few hundred
 * units and the fits.
 */
import { parentPort } from "node:worker_threads";

import Libsql from "libsql";

import { runStep, type Connection } from "@/db/sync-write";

import type { PeriodKResult } from "./k-fit";
import {
  makePeriodFitter,
  type HelperCheckpoint,
  type HelperIdleQuestion,
  type HelperWritePart,
  type KFitJob,
  type KFitReply,
} from "./k-fit-helper";

const port = parentPort;
if (!port) throw new Error("lib/series/k-fit-worker.ts runs only as a worker thread");

/** This thread's own connection to each database it has written to. */
const connections = new Map<string, Connection>();
/** The write in progress: its id, its connection once open, and its first error. */
let open: { id: number; connection: Connection | null; error: string | null } | null = null;

const messageOf = (error: unknown) => (error instanceof Error ? error.message : String(error));

function connect(file: string): Connection {
  let connection = connections.get(file);
  if (!connection) {
    connection = new Libsql(file, { timeout: 5_000 });
    // As on the server's own connection (db/client.ts).
    connection.exec("PRAGMA synchronous = NORMAL");
    // This thread checkpoints after answering instead (checkpointAfter).
    connection.exec("PRAGMA wal_autocheckpoint = 0");
    connections.set(file, connection);
  }
  return connection;
}

function rollBack(connection: Connection | null): void {
  if (connection?.inTransaction) connection.exec("ROLLBACK");
}

/**
 * One part of a write (startHelperWrite): the first begins the transaction,
 * each runs its steps (none after an error), the last commits or rolls
 * back, and only the last is answered.
 */
function writePart({ id, write }: HelperWritePart): KFitReply | null {
  if (open?.id !== id) {
    // A write whose last part never came (its sender gave up) goes.
    if (open) rollBack(open.connection);
    open = { id, connection: null, error: null };
    try {
      open.connection = connect(write.file);
      open.connection.exec("BEGIN IMMEDIATE");
    } catch (error) {
      open.error = messageOf(error);
    }
  }
  const current = open;
  if (current.error === null) {
    try {
      for (const step of write.steps) runStep(current.connection!, step);
    } catch (error) {
      current.error = messageOf(error);
    }
  }
  if (write.end === "more") return null;
  open = null;
  if (write.end === "commit" && current.error === null) {
    try {
      current.connection!.exec("COMMIT");
      return { id, written: true };
    } catch (error) {
      current.error = messageOf(error);
    }
  }
  try {
    rollBack(current.connection);
  } catch (error) {
    current.error ??= messageOf(error);
  }
  return write.end === "abort" ? { id, written: true } : { id, error: current.error ?? "Not written" };
}

/** What the last checkpoint did (whenHelperIdle reports it). */
let lastCheckpoint: HelperCheckpoint | null = null;

/**
 * After a committed write, copies the write-ahead log into the database
 * file (a passive checkpoint: readers and writers go on meanwhile). SQLite
 * does this itself at the commit that takes the log past 1,000 pages, which
 * every full recompute does (about 1,000 pages), and the server's thread
 * would then wait for it (7–10 ms) before the recompute is done. Here it
 * runs once the server's thread has the answer. Messages are taken in
 * order, so the next job starts after it (whenHelperIdle waits for it).
 */
function checkpointAfter(file: string): void {
  try {
    const row = connect(file).prepare("PRAGMA wal_checkpoint(PASSIVE)").raw().get() as number[];
    lastCheckpoint = { busy: row[0] === 1, logPages: Number(row[1]), checkpointedPages: Number(row[2]) };
  } catch (error) {
    // A checkpoint that cannot run now runs after a later write.
    console.warn(`Checkpoint after a helper write failed: ${messageOf(error)}`);
  }
}

port.on("message", (message: KFitJob | HelperWritePart | HelperIdleQuestion) => {
  if ("idle" in message) {
    port.postMessage({ id: message.id, idle: true, lastCheckpoint } satisfies KFitReply);
    return;
  }
  if ("write" in message) {
    const reply = writePart(message);
    if (reply) port.postMessage(reply);
    if (reply && "written" in reply && message.write.end === "commit") checkpointAfter(message.write.file);
    return;
  }
  const job = message;
  let reply: KFitReply;
  try {
    const fit = makePeriodFitter(job);
    // No anchors: a period whose pilot is missing is fitted again, in order,
    // on the server's thread (see fitAllPeriods).
    const noAnchors = new Float64Array(job.units.length).fill(Number.NaN);
    const results: Array<{ position: number; result: PeriodKResult }> = [];
    for (;;) {
      const taken = Atomics.add(job.next, 0, 1);
      if (taken >= job.periods.length) break;
      const position = job.order[taken]!;
      results.push({ position, result: fit(job.periods[position]!, noAnchors) });
    }
    reply = { id: job.id, results };
  } catch (error) {
    reply = { id: job.id, error: error instanceof Error ? error.message : String(error) };
  }
  port.postMessage(reply);
});

port.postMessage({ ready: true } satisfies KFitReply);
