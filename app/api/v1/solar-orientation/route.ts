import { ROLES } from "@/lib/auth/roles";
import { requireRole } from "@/lib/auth/session";
import { invalidInput } from "@/lib/http/errors";
import { handleRoute } from "@/lib/http/respond";
import { solarOrientation } from "@/lib/solar/ephemeris";
import { solarOrientationQuerySchema } from "@/lib/validation/tracing";

/** P, B0, L0, Carrington rotation and semidiameter for one instant (IAU rotation model). */
export const GET = handleRoute(async (request: Request) => {
  await requireRole(ROLES, { request });
  const parsed = solarOrientationQuerySchema.safeParse(Object.fromEntries(new URL(request.url).searchParams));
  if (!parsed.success)
    throw invalidInput(parsed.error, parsed.error.issues[0]?.message ?? "The query string needs attention.");
  const at = parsed.data.at;
  const orientation = solarOrientation(at);
  return Response.json(
    {
      at: at.toISOString(),
      ...orientation,
      units: { p: "deg", b0: "deg", l0: "deg", semidiameterArcsec: "arcsec", distanceAu: "au" },
      model: "IAU rotation elements of the Sun (Archinal et al. 2011); Sun position from VSOP87",
    },
    // The answer for an instant never changes.
    { headers: { "cache-control": "private, max-age=86400" } },
  );
});
