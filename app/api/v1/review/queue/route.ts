import { countAwaitingReview, listReviewQueue } from "@/db/queries/review";
import { requireRole } from "@/lib/auth/session";
import { invalidInput } from "@/lib/http/errors";
import { handleRoute } from "@/lib/http/respond";
import { reviewQueueQuerySchema } from "@/lib/validation/review";

/** The Review desk's queue, a page at a time, with the count waiting in each tab. */
export const GET = handleRoute(async (request: Request) => {
  await requireRole(["coordinator"], { request });
  const parsed = reviewQueueQuerySchema.safeParse(Object.fromEntries(new URL(request.url).searchParams));
  if (!parsed.success) throw invalidInput(parsed.error, "The query string needs attention.");
  const q = parsed.data;
  const [{ rows, total }, counts] = await Promise.all([listReviewQueue(q), countAwaitingReview()]);
  return Response.json({ data: rows, page: q.page, pageSize: q.pageSize, total, counts });
});
