import { requireObserver } from "@/lib/auth/session";
import { archiveInstrument } from "@/lib/instruments/manage";
import { handleRoute } from "@/lib/http/respond";

type Context = { params: Promise<{ id: string }> };

/** Archives the instrument: it leaves the lists but stays on its observations. Repeating it changes nothing. */
export const POST = handleRoute(async (request: Request, context: Context) => {
  const { observer } = await requireObserver(undefined, { request });
  const { id } = await context.params;
  return Response.json(
    await archiveInstrument({ observerId: observer.id, instrumentId: id, archived: true }),
  );
});

/** Brings an archived instrument back into use. */
export const DELETE = handleRoute(async (request: Request, context: Context) => {
  const { observer } = await requireObserver(undefined, { request });
  const { id } = await context.params;
  return Response.json(
    await archiveInstrument({ observerId: observer.id, instrumentId: id, archived: false }),
  );
});
