import "server-only";

import { createHash } from "node:crypto";

import {
  claimIdempotencyKey,
  completeIdempotencyKey,
  findIdempotencyRecord,
  releaseIdempotencyKey,
} from "@/db/queries/idempotency";

import { AppError } from "./errors";

const KEY_PATTERN = /^[A-Za-z0-9_\-:.]{8,128}$/;

/**
 * Runs a write at most once per Idempotency-Key. A repeat with the same key
 * and the same body gets the first answer again; the same key with another
 * body is refused, since it is almost certainly a client bug.
 */
export async function withIdempotency(
  { request, userId, scope, body }: { request: Request; userId: string; scope: string; body: unknown },
  run: () => Promise<{ status: number; body: unknown }>,
): Promise<Response> {
  const key = request.headers.get("idempotency-key");
  if (key === null) {
    const result = await run();
    return Response.json(result.body, { status: result.status });
  }
  if (!KEY_PATTERN.test(key)) {
    throw new AppError("bad_request", "Idempotency-Key must be 8–128 letters, digits, '-', '_', ':' or '.'.");
  }
  const requestHash = createHash("sha256").update(JSON.stringify(body)).digest("hex");
  const ref = { userId, scope, key };

  if (!(await claimIdempotencyKey({ ...ref, requestHash }))) {
    const record = await findIdempotencyRecord(ref);
    if (!record) throw new AppError("conflict", "This Idempotency-Key is being used; try again.");
    if (record.requestHash !== requestHash) {
      throw new AppError("conflict", "This Idempotency-Key was already used for a different request.");
    }
    if (record.responseStatus === 0) {
      throw new AppError("conflict", "A request with this Idempotency-Key is still being processed.", {
        headers: { "Retry-After": "1" },
      });
    }
    return new Response(record.responseBody, {
      status: record.responseStatus,
      headers: { "content-type": "application/json", "idempotent-replayed": "true" },
    });
  }

  try {
    const result = await run();
    const text = JSON.stringify(result.body);
    await completeIdempotencyKey({ ...ref, responseStatus: result.status, responseBody: text });
    return new Response(text, { status: result.status, headers: { "content-type": "application/json" } });
  } catch (error) {
    // A failed write stores nothing, so the same key may be tried again.
    await releaseIdempotencyKey(ref);
    throw error;
  }
}
