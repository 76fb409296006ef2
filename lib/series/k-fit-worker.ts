/**
 * The k-fit helper thread (started by lib/series/k-fit-helper.ts): takes
 * periods one at a time from those it is sent, as the server's own thread
 * does, fits them with the same code, and sends the results back. The
 * counts arrive in shared memory, so nothing is copied but the few hundred
 * units and the fits.
 */
import { parentPort } from "node:worker_threads";

import type { PeriodKResult } from "./k-fit";
import { makePeriodFitter, type KFitJob, type KFitReply } from "./k-fit-helper";

const port = parentPort;
if (!port) throw new Error("lib/series/k-fit-worker.ts runs only as a worker thread");

port.on("message", (job: KFitJob) => {
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
