import { getObserverById } from "@/db/queries/imports";
import { getObserverByUserId } from "@/db/queries/observers";
import { roleSatisfies } from "@/lib/auth/roles";
import { requireRole } from "@/lib/auth/session";
import { attachmentHeaders, streamObservationsCsv, streamObservationsJson } from "@/lib/export/observations";
import { AppError, invalidInput } from "@/lib/http/errors";
import { handleRoute } from "@/lib/http/respond";
import { logbookExportQuerySchema } from "@/lib/validation/export";

/**
 * A complete Logbook: the caller's own, or (for coordinators) any
 * observer's. CSV, or JSON with the disk-tracer groups and positions.
 */
export const GET = handleRoute(async (request: Request) => {
  const user = await requireRole(["observer", "student", "coordinator"], { request });
  const parsed = logbookExportQuerySchema.safeParse(Object.fromEntries(new URL(request.url).searchParams));
  if (!parsed.success) throw invalidInput(parsed.error, "The query string needs attention.");
  const { format, observerId } = parsed.data;

  const own = await getObserverByUserId({ userId: user.id });
  const isCoordinator = roleSatisfies({ role: user.role, required: ["coordinator"] });
  const observer =
    observerId === undefined || observerId === own?.id
      ? own
      : isCoordinator
        ? await getObserverById({ observerId })
        : null;
  if (!observer) {
    throw observerId === undefined
      ? new AppError("invalid_input", "Say whose Logbook to export: add observerId to the query string.")
      : new AppError("not_found", "No such observer.");
  }

  const stamp = new Date().toISOString().slice(0, 10);
  const base = `heliotally-logbook-${observer.code}-${stamp}`;
  if (format === "json") {
    const stream = streamObservationsJson({
      observerId: observer.id,
      observer: { code: observer.code, displayName: observer.displayName, timeZone: observer.timeZone },
    });
    return new Response(stream, {
      headers: attachmentHeaders({ fileName: `${base}.json`, type: "application/json; charset=utf-8" }),
    });
  }
  return new Response(streamObservationsCsv({ observerId: observer.id }), {
    headers: attachmentHeaders({ fileName: `${base}.csv`, type: "text/csv; charset=utf-8" }),
  });
});
