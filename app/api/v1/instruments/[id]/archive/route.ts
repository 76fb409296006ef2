import { requireObserver } from "@/lib/auth/session";
import { archiveInstrument } from "@/lib/instruments/manage";
import { withIdempotency } from "@/lib/http/idempotency";
import { handleRoute } from "@/lib/http/respond";

type Context = { params: Promise<{ id: string }> };

/** Archives the instrument: it leaves the lists but stays on its observations. Repeating it changes nothing. */
export const POST = handleRoute(async (request: Request, context: Context) => {
  const { user, observer } = await requireObserver(undefined, { request });
  const { id } = await context.params;
  return withIdempotency(
    { request, userId: user.id, scope: `POST /api/v1/instruments/${id}/archive`, body: null },
    async () => ({
      status: 200,
      body: await archiveInstrument({ observerId: observer.id, instrumentId: id, archived: true }),
    }),
  );
});

/** Brings an archived instrument back into use. */
export const DELETE = handleRoute(async (request: Request, context: Context) => {
  const { user, observer } = await requireObserver(undefined, { request });
  const { id } = await context.params;
  return withIdempotency(
    { request, userId: user.id, scope: `DELETE /api/v1/instruments/${id}/archive`, body: null },
    async () => ({
      status: 200,
      body: await archiveInstrument({ observerId: observer.id, instrumentId: id, archived: false }),
    }),
  );
});
