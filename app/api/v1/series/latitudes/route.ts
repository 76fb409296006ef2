import { listGroupLatitudes } from "@/db/queries/series-read";
import { ROLES } from "@/lib/auth/roles";
import { requireRole } from "@/lib/auth/session";
import { handleRoute } from "@/lib/http/respond";

/** Latitudes of the groups measured on accepted counts, for the latitude–time diagram. */
export const GET = handleRoute(async (request: Request) => {
  await requireRole(ROLES, { request });
  return Response.json(await listGroupLatitudes(), { headers: { "cache-control": "private, no-store" } });
});
