/**
 * The k-fit helper thread (started by lib/series/k-fit-helper.ts): takes
 * periods one at a time from those it is sent, as the server's own thread
 * does, fits them with fitPeriodK, the same code, and sends the results back. The counts arrive in shared memory, so
 * nothing is copied but the few hundred units and the fits.
 */
import { parentPort } from "node:worker_threads";

import { fitPeriodK, type PeriodKResult } from "./k-fit";
import type { KFitJob, KFitReply } from "./k-fit-helper";

const port = parentPort;
if (!port) throw new Error("lib/series/k-fit-worker.ts runs only as a worker thread");

port.on("message", (job: KFitJob) => {
  let reply: KFitReply;
  try {
    const reference =
      job.reference.kind === "network"
        ? job.reference
        : {
            kind: "series" as const,
            valueOfDay: (day: number) => (job.reference as { values: Map<number, number> }).values.get(day),
          };
    // No anchors: a period whose pilot is missing is fitted again, in order,
    // on the server's thread (see fitAllPeriods).
    const anchorK = new Float64Array(job.units.length).fill(Number.NaN);
    const results: Array<{ position: number; result: PeriodKResult }> = [];
    for (;;) {
      const taken = Atomics.add(job.next, 0, 1);
      if (taken >= job.periods.length) break;
      const position = job.order[taken]!;
      const period = job.periods[position]!;
      results.push({
        position,
        result: fitPeriodK({
          counts: job.counts,
          from: period.from,
          to: period.to,
          units: job.units,
          periodIndex: period.key,
          method: job.method,
          minCommonDays: job.minCommonDays,
          reference,
          anchorK,
        }),
      });
    }
    reply = { id: job.id, results };
  } catch (error) {
    reply = { id: job.id, error: error instanceof Error ? error.message : String(error) };
  }
  port.postMessage(reply);
});

port.postMessage({ ready: true } satisfies KFitReply);
