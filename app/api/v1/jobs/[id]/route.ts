import { getJob } from "@/db/queries/jobs";
import { requireRole } from "@/lib/auth/session";
import { AppError } from "@/lib/http/errors";
import { handleRoute } from "@/lib/http/respond";

type Context = { params: Promise<{ id: string }> };

/** A background job's status and progress (0..1), polled by the coordinator's progress bar. */
export const GET = handleRoute(async (request: Request, context: Context) => {
  await requireRole(["coordinator"], { request });
  const { id } = await context.params;
  const job = await getJob({ jobId: id });
  if (!job) throw new AppError("not_found", "No such job.");
  return Response.json({ job }, { headers: { "cache-control": "no-store" } });
});
