import { listObservationsByObserver } from "@/db/queries/observations";
import { mapPhotoIdsByObservation } from "@/db/queries/photos";
import { requireObserver } from "@/lib/auth/session";
import { invalidInput } from "@/lib/http/errors";
import { withIdempotency } from "@/lib/http/idempotency";
import { readJsonBody } from "@/lib/http/read-json";
import { handleRoute } from "@/lib/http/respond";
import { submitObservation } from "@/lib/observations/submit";
import { observationInputSchema } from "@/lib/validation/observation";
import { observationListQuerySchema } from "@/lib/validation/observation-query";

/** The caller's own observations, a page at a time. */
export const GET = handleRoute(async (request: Request) => {
  const { observer } = await requireObserver(undefined, { request });
  const parsed = observationListQuerySchema.safeParse(Object.fromEntries(new URL(request.url).searchParams));
  if (!parsed.success) throw invalidInput(parsed.error, "The query string needs attention.");
  const q = parsed.data;
  const { rows, total } = await listObservationsByObserver({
    observerId: observer.id,
    page: q.page,
    pageSize: q.pageSize,
    sort: q.sort === "observedAt:asc" ? "asc" : "desc",
    from: q.from,
    to: q.to,
  });
  // The newest photo of each row, for the list's thumbnail.
  const photoIds = await mapPhotoIdsByObservation({ observationIds: rows.map((r) => r.id) });
  const data = rows.map((r) => ({ ...r, photoId: photoIds.get(r.id) ?? null }));
  return Response.json({ data, page: q.page, pageSize: q.pageSize, total });
});

/** Logs one observation for the caller. Honours Idempotency-Key. */
export const POST = handleRoute(async (request: Request) => {
  const { user, observer } = await requireObserver(undefined, { request });
  const body = await readJsonBody(request);
  const parsed = observationInputSchema.safeParse(body);
  if (!parsed.success) throw invalidInput(parsed.error);
  return withIdempotency(
    { request, userId: user.id, scope: "POST /api/v1/observations", body },
    async () => ({
      status: 201,
      body: await submitObservation({
        observerId: observer.id,
        input: parsed.data,
        source: request.headers.get("x-heliotally-client") === "logbook-form" ? "form" : "api",
      }),
    }),
  );
});
