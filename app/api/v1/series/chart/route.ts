import { getChartSeries } from "@/db/queries/series-read";
import { ROLES } from "@/lib/auth/roles";
import { requireRole } from "@/lib/auth/session";
import { handleRoute } from "@/lib/http/respond";

/** Every daily and monthly value of the network series, shaped for the Archive charts. */
export const GET = handleRoute(async (request: Request) => {
  await requireRole(ROLES, { request });
  return Response.json(await getChartSeries(), { headers: { "cache-control": "private, no-store" } });
});
