import { getTracingPngForReader } from "@/db/queries/tracings";
import { ROLES } from "@/lib/auth/roles";
import { requireRole } from "@/lib/auth/session";
import { AppError } from "@/lib/http/errors";
import { handleRoute } from "@/lib/http/respond";

type Context = { params: Promise<{ id: string }> };

/** The tracing's rendered picture, for the same readers as the tracing itself. */
export const GET = handleRoute(async (request: Request, context: Context) => {
  const user = await requireRole(ROLES, { request });
  const { id } = await context.params;
  const found = await getTracingPngForReader({ reader: user, observationId: id });
  if (!found) throw new AppError("not_found", "No tracing picture for this observation.");
  return new Response(new Uint8Array(found.png), {
    headers: {
      "content-type": "image/png",
      // Links carry ?revision=, so a new save gets a new URL; private: it is someone's own drawing.
      "cache-control": "private, max-age=3600",
    },
  });
});
