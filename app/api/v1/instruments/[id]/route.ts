import { requireObserver } from "@/lib/auth/session";
import {
  getInstrumentForReader,
  removeInstrument,
  requireInstrumentReader,
  reviseInstrument,
} from "@/lib/instruments/manage";
import { invalidInput } from "@/lib/http/errors";
import { withIdempotency } from "@/lib/http/idempotency";
import { readJsonBody } from "@/lib/http/read-json";
import { handleRoute } from "@/lib/http/respond";
import { instrumentInputSchema } from "@/lib/validation/instrument";

type Context = { params: Promise<{ id: string }> };

export const GET = handleRoute(async (request: Request, context: Context) => {
  const reader = await requireInstrumentReader({ request });
  const { id } = await context.params;
  return Response.json(await getInstrumentForReader({ reader, instrumentId: id }));
});

/** Replaces the profile (the whole profile is sent again, lengths in mm). */
export const PUT = handleRoute(async (request: Request, context: Context) => {
  const { user, observer } = await requireObserver(undefined, { request });
  const { id } = await context.params;
  const body = await readJsonBody(request);
  const parsed = instrumentInputSchema.safeParse(body);
  if (!parsed.success) throw invalidInput(parsed.error);
  return withIdempotency(
    { request, userId: user.id, scope: `PUT /api/v1/instruments/${id}`, body },
    async () => ({
      status: 200,
      body: await reviseInstrument({ observerId: observer.id, instrumentId: id, input: parsed.data }),
    }),
  );
});

/**
 * Only an instrument no observation uses can be deleted; others answer 409 and can be archived.
 * Honours Idempotency-Key: a retried delete gets its 204 again rather than a 404.
 */
export const DELETE = handleRoute(async (request: Request, context: Context) => {
  const { user, observer } = await requireObserver(undefined, { request });
  const { id } = await context.params;
  return withIdempotency(
    { request, userId: user.id, scope: `DELETE /api/v1/instruments/${id}`, body: null },
    async () => {
      await removeInstrument({ observerId: observer.id, instrumentId: id });
      return { status: 204, body: undefined };
    },
  );
});
