import { getObserverSummary, listKHistory } from "@/db/queries/k";
import { getObserverByUserId } from "@/db/queries/observers";
import { getObserverAgainstNetwork } from "@/db/queries/series-read";
import { ROLES, roleSatisfies } from "@/lib/auth/roles";
import { requireRole } from "@/lib/auth/session";
import { AppError, invalidInput } from "@/lib/http/errors";
import { handleRoute } from "@/lib/http/respond";
import { observerChartQuerySchema } from "@/lib/validation/series-query";

const notFound = () => new AppError("not_found", "No such observer.");

/**
 * One observer's scaled counts against the network, with their fitted k.
 * Coordinators and admins may ask for anyone (?observerId=...); everyone
 * else sees only themselves, and asking for someone else answers 404.
 */
export const GET = handleRoute(async (request: Request) => {
  const user = await requireRole(ROLES, { request });
  const parsed = observerChartQuerySchema.safeParse(Object.fromEntries(new URL(request.url).searchParams));
  if (!parsed.success) throw invalidInput(parsed.error, "The query string needs attention.");
  let observerId = parsed.data.observerId;
  if (!roleSatisfies({ role: user.role, required: ["coordinator"] })) {
    const own = await getObserverByUserId({ userId: user.id });
    if (!own || (observerId && observerId !== own.id)) throw notFound();
    observerId = own.id;
  }
  if (!observerId)
    throw new AppError("invalid_input", "Choose an observer.", {
      issues: [{ path: "observerId", message: "Choose an observer." }],
    });
  const observer = await getObserverSummary({ observerId });
  if (!observer) throw notFound();
  const [points, k] = await Promise.all([
    getObserverAgainstNetwork({ observerId }),
    listKHistory({ observerId }),
  ]);
  return Response.json({ observer, points, k }, { headers: { "cache-control": "private, no-store" } });
});
