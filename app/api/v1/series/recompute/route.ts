import { startRecomputeJob } from "@/db/queries/recompute";
import { requireRole } from "@/lib/auth/session";
import { withIdempotency } from "@/lib/http/idempotency";
import { handleRoute } from "@/lib/http/respond";

/**
 * Starts a full recompute of every k and the whole series in the background
 * (202 with the job to follow at /api/v1/jobs/[id]). While one is already
 * queued or running, answers 200 with that one instead of starting another.
 * Honours Idempotency-Key (a replay answers the first job, with its Location).
 */
export const POST = handleRoute(async (request: Request) => {
  const user = await requireRole(["coordinator"], { request });
  const response = await withIdempotency(
    { request, userId: user.id, scope: "POST /api/v1/series/recompute", body: null },
    async () => {
      const { job, started } = await startRecomputeJob({ requestedByUserId: user.id });
      return { status: started ? 202 : 200, body: { job } };
    },
  );
  // The replay keeps only status and body, so the Location is rebuilt from the job in it.
  const { job } = (await response.clone().json()) as { job: { id: string } };
  response.headers.set("location", `/api/v1/jobs/${job.id}`);
  return response;
});
