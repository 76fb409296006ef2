import { listDecisionLog } from "@/db/queries/review";
import { requireRole } from "@/lib/auth/session";
import { streamDecisionLogCsv } from "@/lib/export/decisions";
import { attachmentHeaders } from "@/lib/export/observations";
import { invalidInput } from "@/lib/http/errors";
import { withIdempotency } from "@/lib/http/idempotency";
import { readJsonBody } from "@/lib/http/read-json";
import { handleRoute } from "@/lib/http/respond";
import { decideObservations } from "@/lib/review/decide";
import { decisionLogQuerySchema, reviewDecisionSchema } from "@/lib/validation/review";

/**
 * Accept, query, reject or reopen one or many observations, all or none.
 * Honours Idempotency-Key, so a retried bulk accept is not refused as a
 * conflict the second time.
 */
export const POST = handleRoute(async (request: Request) => {
  const user = await requireRole(["coordinator"], { request });
  const body = await readJsonBody(request);
  const parsed = reviewDecisionSchema.safeParse(body);
  if (!parsed.success) throw invalidInput(parsed.error);
  return withIdempotency(
    { request, userId: user.id, scope: "POST /api/v1/review/decisions", body },
    async () => ({
      status: 200,
      body: await decideObservations({ actorUserId: user.id, input: parsed.data }),
    }),
  );
});

/** The Decision log: every line of the audit trail across the network, a page at a time or (format=csv) all of it. */
export const GET = handleRoute(async (request: Request) => {
  await requireRole(["coordinator"], { request });
  const parsed = decisionLogQuerySchema.safeParse(Object.fromEntries(new URL(request.url).searchParams));
  if (!parsed.success) throw invalidInput(parsed.error, "The query string needs attention.");
  const q = parsed.data;
  if (q.format === "csv") {
    return new Response(streamDecisionLogCsv(q), {
      headers: attachmentHeaders({
        fileName: `heliotally-decision-log-${new Date().toISOString().slice(0, 10)}.csv`,
        type: "text/csv; charset=utf-8",
      }),
    });
  }
  const { rows, total } = await listDecisionLog(q);
  return Response.json({ data: rows, page: q.page, pageSize: q.pageSize, total });
});
