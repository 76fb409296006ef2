import "server-only";

import { afterWritesOpen, inWriteTransaction, ownConnection, type Database } from "./client";
import { insertRows } from "./queries/series";
import { rowCountOfStep, rowOfStep, runStepsAllOrNothing, type WriteStep } from "./sync-write";

export type { WriteStep } from "./sync-write";

/**
 * Runs the steps (statements, and multi-row inserts of many rows) in one
 * write transaction: all of them or, on any error, none.
 *
 * On an embedded database it runs them synchronously on the process's own
 * connection (ownConnection, db/client.ts), on statements prepared once per
 * table: tens of thousands of rows then take about half the time they take
 * through the client, which prepares every statement again and converts
 * every value on the way (measured in tests/bench/series.bench.ts). The
 * event loop waits for the whole write (the full recompute of a million
 * counts writes about 35,000 rows, some 100 ms; it hands them to a helper
 * thread instead when it can, db/queries/recompute.ts). In return no other
 * request of this process can take its turn while the write lock is held:
 * a second writer here would wait for the lock on this same thread, which
 * would deadlock until its busy timeout.
 * With a libSQL server or an embedded replica, the steps go through a
 * client transaction.
 */
export async function writeAllOrNothing(db: Database, steps: readonly WriteStep[]): Promise<void> {
  const connection = ownConnection(db);
  if (!connection) {
    await writeThroughClient(db, steps);
    return;
  }
  // Not while the helper thread writes a recompute (holdWrites, db/client.ts).
  await afterWritesOpen(() => runStepsAllOrNothing(connection, steps));
}

async function writeThroughClient(db: Database, steps: readonly WriteStep[]): Promise<void> {
  await inWriteTransaction(db, async (tx) => {
    for (const step of steps) {
      if ("sql" in step) await tx.execute({ sql: step.sql, args: step.args ?? [] });
      else {
        const rows = Array.from({ length: rowCountOfStep(step) }, (_, r) => rowOfStep(step, r));
        await insertRows({ tx, table: step.table, columns: step.columns, rows });
      }
    }
  });
}
