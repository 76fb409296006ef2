import { getSeriesPageJson } from "@/db/queries/series-cache";
import { exportSeriesCsv } from "@/db/queries/series-read";
import { ROLES } from "@/lib/auth/roles";
import { requireRole } from "@/lib/auth/session";
import { AppError, invalidInput } from "@/lib/http/errors";
import { handleRoute } from "@/lib/http/respond";
import { parseSeriesPath, seriesQuerySchema } from "@/lib/validation/series-query";

type Context = { params: Promise<{ kind: string }> };

/**
 * GET /api/v1/series/daily|monthly|yearly: the published network series, a
 * page at a time (JSON), or the whole filtered range as CSV with
 * ?format=csv or a ".csv" path (/api/v1/series/daily.csv). Every signed-in
 * role may read it.
 */
export const GET = handleRoute(async (request: Request, context: Context) => {
  await requireRole(ROLES, { request });
  const path = parseSeriesPath((await context.params).kind);
  if (!path) throw new AppError("not_found", "No such series: use daily, monthly or yearly.");
  const parsed = seriesQuerySchema(path.kind).safeParse(
    Object.fromEntries(new URL(request.url).searchParams),
  );
  if (!parsed.success) throw invalidInput(parsed.error, "The query string needs attention.");
  const query = parsed.data;

  if (path.csv || query.format === "csv") {
    const csv = await exportSeriesCsv({ kind: path.kind, query });
    const name = `heliotally-${path.kind}-${query.hemisphere}${query.from ? `-from-${query.from}` : ""}${query.to ? `-to-${query.to}` : ""}.csv`;
    return new Response(csv, {
      headers: {
        "content-type": "text/csv; charset=utf-8",
        "content-disposition": `attachment; filename="${name}"`,
        "cache-control": "private, no-store",
      },
    });
  }

  return new Response(await getSeriesPageJson({ kind: path.kind, query }), {
    headers: { "content-type": "application/json" },
  });
});
