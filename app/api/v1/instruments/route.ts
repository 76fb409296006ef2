import {
  createInstrument,
  listInstrumentsForReader,
  requireInstrumentReader,
} from "@/lib/instruments/manage";
import { requireObserver } from "@/lib/auth/session";
import { invalidInput } from "@/lib/http/errors";
import { withIdempotency } from "@/lib/http/idempotency";
import { readJsonBody } from "@/lib/http/read-json";
import { handleRoute } from "@/lib/http/respond";
import { instrumentInputSchema, instrumentListQuerySchema } from "@/lib/validation/instrument";

/**
 * The caller's own instruments, in use first then archived. Coordinators (and
 * admins) read any observer's list with ?observerId=…, without changing it.
 */
export const GET = handleRoute(async (request: Request) => {
  const reader = await requireInstrumentReader({ request });
  const parsed = instrumentListQuerySchema.safeParse(Object.fromEntries(new URL(request.url).searchParams));
  if (!parsed.success) throw invalidInput(parsed.error, "The query string needs attention.");
  return Response.json({
    data: await listInstrumentsForReader({ reader, observerId: parsed.data.observerId }),
  });
});

/** Adds an instrument. Lengths are millimetres (the form converts inches first). Honours Idempotency-Key. */
export const POST = handleRoute(async (request: Request) => {
  const { user, observer } = await requireObserver(undefined, { request });
  const body = await readJsonBody(request);
  const parsed = instrumentInputSchema.safeParse(body);
  if (!parsed.success) throw invalidInput(parsed.error);
  return withIdempotency({ request, userId: user.id, scope: "POST /api/v1/instruments", body }, async () => ({
    status: 201,
    body: await createInstrument({ observerId: observer.id, input: parsed.data }),
  }));
});
