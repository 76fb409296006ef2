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
import { makePeriodFitter, type HelperWritePart, type KFitJob, type KFitReply } from "./k-fit-helper";

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

port.on("message", (message: KFitJob | HelperWritePart) => {
  if ("write" in message) {
    const reply = writePart(message);
    if (reply) port.postMessage(reply);
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
