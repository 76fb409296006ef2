import { ROLES } from "@/lib/auth/roles";
import { requireRole } from "@/lib/auth/session";
import { invalidInput } from "@/lib/http/errors";
import { handleRoute } from "@/lib/http/respond";
import { solarOrientation } from "@/lib/solar/ephemeris";
import { renderDiskTemplateSvg } from "@/lib/tracer/template-svg";
import { diskTemplateQuerySchema, templateInstant } from "@/lib/validation/disk-template";

/** The printable disk template as SVG at true size: ?date=YYYY-MM-DD&time=HH:MM&diameterMm=150&mirrored=false. */
export const GET = handleRoute(async (request: Request) => {
  await requireRole(ROLES, { request });
  const parsed = diskTemplateQuerySchema.safeParse(Object.fromEntries(new URL(request.url).searchParams));
  if (!parsed.success)
    throw invalidInput(parsed.error, parsed.error.issues[0]?.message ?? "The query string needs attention.");
  const { diameterMm, mirrored, date } = parsed.data;
  const at = templateInstant(parsed.data);
  const svg = renderDiskTemplateSvg({ at, orientation: solarOrientation(at), diameterMm, mirrored });
  return new Response(svg, {
    headers: {
      "content-type": "image/svg+xml; charset=utf-8",
      "content-disposition": `inline; filename="disk-template-${date}-${Math.round(diameterMm)}mm.svg"`,
      "cache-control": "private, max-age=3600",
    },
  });
});
