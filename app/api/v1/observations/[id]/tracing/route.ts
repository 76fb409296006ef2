import { findTracingForReader } from "@/db/queries/tracings";
import { ROLES } from "@/lib/auth/roles";
import { requireObserver, requireRole } from "@/lib/auth/session";
import { AppError, invalidInput } from "@/lib/http/errors";
import { withIdempotency } from "@/lib/http/idempotency";
import { readJsonBody } from "@/lib/http/read-json";
import { handleRoute } from "@/lib/http/respond";
import { saveObservationTracing } from "@/lib/tracer/save";
import { MAX_SAVE_REQUEST_BYTES, saveTracingRequestSchema } from "@/lib/validation/tracing";

type Context = { params: Promise<{ id: string }> };

// Missing, someone else's and not-yet-traced all answer 404 with the same
// words, so ids cannot be probed.
const notFound = () => new AppError("not_found", "No tracing for this observation.");

/** The tracing as saved (vector JSON), with its measured groups. Owner, coordinators, the owner's educator. */
export const GET = handleRoute(async (request: Request, context: Context) => {
  const user = await requireRole(ROLES, { request });
  const { id } = await context.params;
  const found = await findTracingForReader({ reader: user, observationId: id });
  if (!found?.tracing) throw notFound();
  const { tracing, groups, observation } = found;
  return Response.json({
    observationId: observation.id,
    observedAt: observation.observedAt.toISOString(),
    revision: tracing.revision,
    formatVersion: tracing.formatVersion,
    updatedAt: tracing.updatedAt.toISOString(),
    document: tracing.vector,
    groups,
    pngUrl: tracing.hasPng
      ? `/api/v1/observations/${observation.id}/tracing/png?revision=${tracing.revision}`
      : null,
  });
});

/**
 * Saves the caller's own tracing, its groups and the observation's counts together.
 * Honours Idempotency-Key: a retried save gets its first answer, not a stale-revision 409.
 */
export const PUT = handleRoute(async (request: Request, context: Context) => {
  const { user, observer } = await requireObserver(undefined, { request });
  const { id } = await context.params;
  const body = await readJsonBody(request, { maxBytes: MAX_SAVE_REQUEST_BYTES });
  const parsed = saveTracingRequestSchema.safeParse(body);
  if (!parsed.success) throw invalidInput(parsed.error);
  return withIdempotency(
    { request, userId: user.id, scope: `PUT /api/v1/observations/${id}/tracing`, body },
    async () => ({
      status: 200,
      body: await saveObservationTracing({ observerId: observer.id, observationId: id, ...parsed.data }),
    }),
  );
});
