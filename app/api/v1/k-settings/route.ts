import { checkKSettingsTargets, getKSettings, saveKSettings } from "@/db/queries/k";
import { requireRole } from "@/lib/auth/session";
import { AppError, invalidInput } from "@/lib/http/errors";
import { withIdempotency } from "@/lib/http/idempotency";
import { readJsonBody } from "@/lib/http/read-json";
import { handleRoute } from "@/lib/http/respond";
import { kSettingsSchema } from "@/lib/validation/k-settings";

/** How k is computed: period, method, minimum of common days, reference, pilot, drift threshold. */
export const GET = handleRoute(async (request: Request) => {
  await requireRole(["coordinator"], { request });
  return Response.json(await getKSettings());
});

/**
 * Saves the k settings (the whole set). They take effect at the next full
 * recompute, which the coordinator starts separately.
 */
export const PUT = handleRoute(async (request: Request) => {
  const user = await requireRole(["coordinator"], { request });
  const body = await readJsonBody(request);
  const parsed = kSettingsSchema.safeParse(body);
  if (!parsed.success) throw invalidInput(parsed.error);
  const { pilotExists, referenceExists } = await checkKSettingsTargets(parsed.data);
  const issues = [
    ...(pilotExists ? [] : [{ path: "pilotObserverId", message: "Choose a pilot from the list." }]),
    ...(referenceExists
      ? []
      : [
          {
            path: "referenceSeriesId",
            message: "That reference series does not exist; choose one from the list.",
          },
        ]),
  ];
  if (issues.length > 0) throw new AppError("invalid_input", "Some fields need attention.", { issues });
  return withIdempotency({ request, userId: user.id, scope: "PUT /api/v1/k-settings", body }, async () => {
    await saveKSettings({ input: parsed.data });
    return { status: 200, body: await getKSettings() };
  });
});
