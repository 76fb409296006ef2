import { startRecomputeJob } from "@/db/queries/recompute";
import { requireRole } from "@/lib/auth/session";
import { handleRoute } from "@/lib/http/respond";

/**
 * Starts a full recompute of every k and the whole series in the background
 * (202 with the job to follow at /api/v1/jobs/[id]). While one is already
 * queued or running, answers 200 with that one instead of starting another.
 */
export const POST = handleRoute(async (request: Request) => {
  const user = await requireRole(["coordinator"], { request });
  const { job, started } = await startRecomputeJob({ requestedByUserId: user.id });
  return Response.json(
    { job },
    { status: started ? 202 : 200, headers: { location: `/api/v1/jobs/${job.id}` } },
  );
});
