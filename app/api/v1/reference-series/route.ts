import { importReferenceSeries, listReferenceSeries } from "@/db/queries/reference-series";
import { requireRole } from "@/lib/auth/session";
import { invalidInput } from "@/lib/http/errors";
import { withIdempotency } from "@/lib/http/idempotency";
import { readJsonBody } from "@/lib/http/read-json";
import { handleRoute } from "@/lib/http/respond";
import { MAX_REFERENCE_CSV_BYTES, referenceImportSchema } from "@/lib/validation/reference-import";

/** Imported reference series, newest first (coordinators and admins). */
export const GET = handleRoute(async (request: Request) => {
  await requireRole(["coordinator"], { request });
  return Response.json({ data: await listReferenceSeries() });
});

/**
 * Imports a reference series: JSON { name, licence, source?, csv } where csv
 * is the file's text (a header naming date and value, one row per UT day).
 * Any bad row refuses the whole file with 400 and one issue per row
 * (path "csv.<row>"); nothing is stored half-way.
 */
export const POST = handleRoute(async (request: Request) => {
  const user = await requireRole(["coordinator"], { request });
  // Room for the CSV at its limit plus JSON escaping and the other fields.
  const body = await readJsonBody(request, { maxBytes: MAX_REFERENCE_CSV_BYTES + 256 * 1024 });
  const parsed = referenceImportSchema.safeParse(body);
  if (!parsed.success)
    throw invalidInput(
      parsed.error,
      "The reference series was not imported: fix the rows listed and upload the file again.",
    );
  return withIdempotency(
    { request, userId: user.id, scope: "POST /api/v1/reference-series", body },
    async () => ({
      status: 201,
      body: await importReferenceSeries({ input: parsed.data, importedByUserId: user.id }),
    }),
  );
});
