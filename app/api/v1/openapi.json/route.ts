import { buildOpenApiDocument } from "@/lib/api/openapi";
import { handleRoute } from "@/lib/http/respond";

/** The API described as OpenAPI 3.1; public, like the /api-docs page. */
export const GET = handleRoute(async (request: Request) => {
  const origin = new URL(request.url).origin;
  return Response.json(buildOpenApiDocument({ origin }), {
    headers: { "cache-control": "public, max-age=300" },
  });
});
