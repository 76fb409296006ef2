import { requireRole } from "@/lib/auth/session";
import { formatCsv } from "@/lib/classrooms/csv";
import { loadTermComparison } from "@/lib/classrooms/views";
import { AppError, invalidInput } from "@/lib/http/errors";
import { handleRoute } from "@/lib/http/respond";
import { termExportQuerySchema } from "@/lib/validation/classroom";

type Context = { params: Promise<{ id: string }> };

/** The term table of one of the educator's classrooms as CSV (what the Term comparison page shows). */
export const GET = handleRoute(async (request: Request, context: Context) => {
  const user = await requireRole(["educator"], { request });
  const { id } = await context.params;
  const parsed = termExportQuerySchema.safeParse(Object.fromEntries(new URL(request.url).searchParams));
  if (!parsed.success) throw invalidInput(parsed.error, "The query string needs attention.");
  const view = await loadTermComparison({
    educatorUserId: user.id,
    classroomId: id,
    method: parsed.data.method,
  });
  if (!view) throw new AppError("not_found", "No such classroom among yours.");
  const slug =
    view.classroom.name
      .toLowerCase()
      .replace(/[^a-z0-9]+/g, "-")
      .replace(/^-|-$/g, "") || "classroom";
  return new Response(formatCsv(view.table), {
    headers: {
      "content-type": "text/csv; charset=utf-8",
      "content-disposition": `attachment; filename="${slug}-term-${view.classroom.termStart}.csv"`,
      "cache-control": "no-store",
    },
  });
});
