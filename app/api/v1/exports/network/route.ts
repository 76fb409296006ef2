import { requireRole } from "@/lib/auth/session";
import { attachmentHeaders, streamObservationsCsv, streamObservationsJson } from "@/lib/export/observations";
import { invalidInput } from "@/lib/http/errors";
import { handleRoute } from "@/lib/http/respond";
import { networkExportQuerySchema } from "@/lib/validation/export";

/** The whole network archive: every observer's every count, whatever its review status. */
export const GET = handleRoute(async (request: Request) => {
  await requireRole(["coordinator"], { request });
  const parsed = networkExportQuerySchema.safeParse(Object.fromEntries(new URL(request.url).searchParams));
  if (!parsed.success) throw invalidInput(parsed.error, "The query string needs attention.");
  const base = `heliotally-network-archive-${new Date().toISOString().slice(0, 10)}`;
  if (parsed.data.format === "json") {
    return new Response(streamObservationsJson({}), {
      headers: attachmentHeaders({ fileName: `${base}.json`, type: "application/json; charset=utf-8" }),
    });
  }
  return new Response(streamObservationsCsv({}), {
    headers: attachmentHeaders({ fileName: `${base}.csv`, type: "text/csv; charset=utf-8" }),
  });
});
