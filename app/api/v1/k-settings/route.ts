import { checkKSettingsTargets, getKSettings, saveKSettings } from "@/db/queries/k";
import { requireRole } from "@/lib/auth/session";
import { AppError, invalidInput } from "@/lib/http/errors";
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
  await requireRole(["coordinator"], { request });
  const parsed = kSettingsSchema.safeParse(await readJsonBody(request));
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
  await saveKSettings({ input: parsed.data });
  return Response.json(await getKSettings());
});
