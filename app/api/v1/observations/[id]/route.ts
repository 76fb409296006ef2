import { getObservationOfObserver } from "@/db/queries/observations";
import { deleteObservationWithPhotos, listPhotoKeysOfObservation } from "@/db/queries/photos";
import { requireObserver } from "@/lib/auth/session";
import { assertSessionCountChangeable } from "@/lib/classrooms/session-edit";
import { AppError, invalidInput } from "@/lib/http/errors";
import { withIdempotency } from "@/lib/http/idempotency";
import { readJsonBody } from "@/lib/http/read-json";
import { handleRoute } from "@/lib/http/respond";
import { reviseObservation } from "@/lib/observations/submit";
import { deleteStoredFiles } from "@/lib/photo-store/storage";
import { observationInputSchema } from "@/lib/validation/observation";

type Context = { params: Promise<{ id: string }> };

// Someone else's observation answers 404, exactly like a missing one, so ids
// cannot be probed.
const notFound = () => new AppError("not_found", "No such observation in your Logbook.");

export const GET = handleRoute(async (request: Request, context: Context) => {
  const { observer } = await requireObserver(undefined, { request });
  const { id } = await context.params;
  const row = await getObservationOfObserver({ observerId: observer.id, observationId: id });
  if (!row) throw notFound();
  return Response.json(row);
});

/** Replaces the observation's values (the whole observation is sent again). */
export const PUT = handleRoute(async (request: Request, context: Context) => {
  const { user, observer } = await requireObserver(undefined, { request });
  const { id } = await context.params;
  if (!(await getObservationOfObserver({ observerId: observer.id, observationId: id }))) throw notFound();
  const body = await readJsonBody(request);
  const parsed = observationInputSchema.safeParse(body);
  if (!parsed.success) throw invalidInput(parsed.error);
  return withIdempotency(
    { request, userId: user.id, scope: `PUT /api/v1/observations/${id}`, body },
    async () => ({
      status: 200,
      body: await reviseObservation({ observerId: observer.id, observationId: id, input: parsed.data }),
    }),
  );
});

/**
 * Deletes the caller's own observation with its photos. The photo files go
 * first: if the store cannot be reached nothing is deleted (and the caller
 * is told), so no file is ever left behind without its observation. A class
 * session's count is deleted only while the session is open.
 * Honours Idempotency-Key: a retried delete gets its 204 again rather than a 404.
 */
export const DELETE = handleRoute(async (request: Request, context: Context) => {
  const { user, observer } = await requireObserver(undefined, { request });
  const { id } = await context.params;
  return withIdempotency(
    { request, userId: user.id, scope: `DELETE /api/v1/observations/${id}`, body: null },
    async () => {
      if (!(await getObservationOfObserver({ observerId: observer.id, observationId: id }))) throw notFound();
      await assertSessionCountChangeable({ observerId: observer.id, observationId: id });
      await deleteStoredFiles({ keys: await listPhotoKeysOfObservation({ observationId: id }) });
      if (!(await deleteObservationWithPhotos({ observerId: observer.id, observationId: id })))
        throw notFound();
      return { status: 204, body: undefined };
    },
  );
});
