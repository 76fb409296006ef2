import { getObserverById } from "@/db/queries/imports";
import { listKHistory } from "@/db/queries/k";
import { getObserverByUserId } from "@/db/queries/observers";
import { ROLES, roleSatisfies } from "@/lib/auth/roles";
import { requireRole } from "@/lib/auth/session";
import { AppError } from "@/lib/http/errors";
import { handleRoute } from "@/lib/http/respond";
import { observerPathSchema } from "@/lib/validation/export";

type Context = { params: Promise<{ id: string }> };

/**
 * An observer's k history: every coefficient for every instrument and
 * period, oldest first. "me" names the caller. Coordinators (and admins) may
 * ask for anyone; everyone else only for themselves, and another observer's
 * id answers 404 as if it did not exist.
 */
export const GET = handleRoute(async (request: Request, context: Context) => {
  const user = await requireRole(ROLES, { request });
  const parsed = observerPathSchema.safeParse(await context.params);
  if (!parsed.success) throw new AppError("not_found", "No such observer.");
  const { id } = parsed.data;
  const own = await getObserverByUserId({ userId: user.id });
  const isCoordinator = roleSatisfies({ role: user.role, required: ["coordinator"] });
  const observer =
    id === "me" || id === own?.id ? own : isCoordinator ? await getObserverById({ observerId: id }) : null;
  if (!observer)
    throw new AppError(
      "not_found",
      id === "me" ? "Your account keeps no Logbook, so it has no k." : "No such observer.",
    );
  const history = await listKHistory({ observerId: observer.id });
  return Response.json(
    { observer: { id: observer.id, code: observer.code, displayName: observer.displayName }, data: history },
    { headers: { "cache-control": "private, no-store" } },
  );
});
