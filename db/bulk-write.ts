import "server-only";

import path from "node:path";
import { Worker } from "node:worker_threads";

import type { InValue } from "@libsql/client";

import { embeddedFileOf, inWriteTransaction, type Database } from "./client";
import { insertRows } from "./queries/series";

export type WriteStep =
  | { sql: string; args?: InValue[] }
  | { table: string; columns: readonly string[]; rows: ReadonlyArray<ReadonlyArray<InValue>> };

/**
 * Runs the steps (statements, and multi-row inserts of many rows) in one
 * write transaction: all of them or, on any error, none.
 *
 * On an embedded database a writer thread runs them
 * (db/bulk-write-worker.mjs), synchronously on a connection of its own, on
 * statements prepared once per table: tens of thousands of rows then take
 * about half the time they take through the client, which prepares every
 * statement again and converts every value on the way (measured in
 * tests/bench/series.bench.ts). The server's event loop only copies the
 * steps to the thread (about 7 ms for the 27,000 daily rows of a million
 * counts) and goes on serving while the thread writes: the write of a full
 * recompute takes about 120 ms. A writer on this thread meanwhile waits for
 * the thread's transaction to end, which needs nothing from this thread.
 * With a libSQL server or an embedded replica, the steps go through a
 * client transaction.
 */
export async function writeAllOrNothing(db: Database, steps: readonly WriteStep[]): Promise<void> {
  const file = embeddedFileOf(db);
  if (!file) {
    await inWriteTransaction(db, async (tx) => {
      for (const step of steps) {
        if ("sql" in step) await tx.execute({ sql: step.sql, args: step.args ?? [] });
        else await insertRows({ tx, ...step });
      }
    });
    return;
  }
  await writerThread().write({ file, steps });
}

type Pending = { resolve: () => void; reject: (error: Error) => void };
type Writer = { write: (job: { file: string; steps: readonly WriteStep[] }) => Promise<void> };

const state = globalThis as unknown as { __heliotallyWriter?: Writer };

/**
 * The one writer thread of this process, started at its first write. It
 * does not keep the process alive; if it ever stops, the writes it had not
 * answered fail and the next write starts a new one.
 */
function writerThread(): Writer {
  if (state.__heliotallyWriter) return state.__heliotallyWriter;
  const worker = new Worker(
    path.join(/*turbopackIgnore: true*/ process.cwd(), "db", "bulk-write-worker.mjs"),
  );
  worker.unref();
  const pending = new Map<number, Pending>();
  let next = 0;
  const stop = (error: Error) => {
    if (state.__heliotallyWriter === writer) delete state.__heliotallyWriter;
    for (const job of pending.values()) job.reject(error);
    pending.clear();
  };
  worker.on(
    "message",
    ({ id, ok, message, code }: { id: number; ok: boolean; message?: string; code?: string }) => {
      const job = pending.get(id);
      pending.delete(id);
      if (!job) return;
      if (ok) job.resolve();
      else job.reject(Object.assign(new Error(message ?? "The write failed"), code ? { code } : {}));
      // Idle: let the process exit without waiting for the thread.
      if (pending.size === 0) worker.unref();
    },
  );
  worker.on("error", (error) => stop(error));
  worker.on("exit", (code) => stop(new Error(`The writer thread stopped (exit code ${code})`)));
  const writer: Writer = {
    write: ({ file, steps }) =>
      new Promise<void>((resolve, reject) => {
        const id = next++;
        pending.set(id, { resolve, reject });
        // Busy: keep the process alive until the thread answers.
        worker.ref();
        try {
          worker.postMessage({ id, file, steps });
        } catch (error) {
          // A value that cannot be copied to the thread: nothing was sent.
          pending.delete(id);
          if (pending.size === 0) worker.unref();
          reject(error instanceof Error ? error : new Error(String(error)));
        }
      }),
  };
  state.__heliotallyWriter = writer;
  return writer;
}
