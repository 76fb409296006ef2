import { requireObserver } from "@/lib/auth/session";
import { submitSessionCount } from "@/lib/classrooms/session-count";
import { invalidInput } from "@/lib/http/errors";
import { withIdempotency } from "@/lib/http/idempotency";
import { readJsonBody } from "@/lib/http/read-json";
import { handleRoute } from "@/lib/http/respond";
import { observationInputSchema } from "@/lib/validation/observation";

type Context = { params: Promise<{ id: string }> };

/**
 * A student logs their count for a class session (the Logbook form's body).
 * Honours Idempotency-Key, so a retried send cannot count twice.
 */
export const POST = handleRoute(async (request: Request, context: Context) => {
  const { user, observer } = await requireObserver(["student"], { request });
  const { id } = await context.params;
  const body = await readJsonBody(request);
  const parsed = observationInputSchema.safeParse(body);
  if (!parsed.success) throw invalidInput(parsed.error);
  return withIdempotency(
    { request, userId: user.id, scope: `POST /api/v1/classroom-sessions/${id}/observations`, body },
    async () => ({
      status: 201,
      body: await submitSessionCount({
        studentUserId: user.id,
        observerId: observer.id,
        sessionId: id,
        input: parsed.data,
      }),
    }),
  );
});
