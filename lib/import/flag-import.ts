import "server-only";

import { flagImportedObservations, listObservationIdsOfBatch } from "@/db/queries/imports";
import { createJob, finishJob, markJobRunning, reportJobProgress } from "@/db/queries/jobs";

/** Imports up to this many new counts are flagged before the answer; larger ones in the background. */
export const INLINE_FLAG_LIMIT = 2000;
export const IMPORT_FLAG_JOB_KIND = "import-flags";
const FLAG_PAGE = 400;

const running = new Set<Promise<void>>();

/**
 * Gives imported counts the Review desk's automatic flags, a page at a
 * time, each page in its own short transaction (so a long import never
 * holds the write lock while flagging).
 */
export async function flagImportBatch({
  batchId,
  onPage,
}: {
  batchId: string;
  onPage?: (flagged: number) => Promise<void>;
}) {
  let afterId: string | null = null;
  let flagged = 0;
  for (;;) {
    const ids = await listObservationIdsOfBatch({ batchId, afterId, limit: FLAG_PAGE });
    if (ids.length === 0) return flagged;
    await flagImportedObservations({ observationIds: ids });
    flagged += ids.length;
    afterId = ids[ids.length - 1]!;
    await onPage?.(flagged);
  }
}

/**
 * Flags are derived data (recomputable at any time): a failure is recorded
 * on the job and logged, and never undoes the import itself.
 */
export async function startImportFlagJob({
  batchId,
  byUserId,
  total,
}: {
  batchId: string;
  byUserId: string;
  total: number;
}): Promise<string> {
  const job = await createJob({
    kind: IMPORT_FLAG_JOB_KIND,
    requestedByUserId: byUserId,
    params: { batchId, total },
  });
  const run = (async () => {
    // Let the request that started the job answer first.
    await new Promise<void>((resolve) => setImmediate(resolve));
    try {
      await markJobRunning({ jobId: job.id });
      await flagImportBatch({
        batchId,
        onPage: (flagged) =>
          reportJobProgress({
            jobId: job.id,
            progress: flagged / total,
            message: `${flagged} of ${total} flagged`,
          }),
      });
      await finishJob({
        jobId: job.id,
        status: "done",
        message: `${total} imported counts flagged for review.`,
      });
    } catch (error) {
      console.error(
        `Flagging import ${batchId} failed; its counts are stored without automatic flags.`,
        error,
      );
      await finishJob({
        jobId: job.id,
        status: "failed",
        message: "Flagging failed; the counts are stored without automatic flags.",
      }).catch(() => undefined);
    }
  })();
  running.add(run);
  void run.finally(() => running.delete(run));
  return job.id;
}

/** For tests and the benchmark: wait until background flagging has finished. */
export async function waitForImportFlagJobs(): Promise<void> {
  while (running.size > 0) await Promise.all([...running]);
}
