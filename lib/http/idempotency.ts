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

/** A write's answer; an undefined body (a 204 after a delete) answers with no body at all. */
function answer({ status, text, replayed = false }: { status: number; text: string; replayed?: boolean }) {
  const headers: Record<string, string> = replayed ? { "idempotent-replayed": "true" } : {};
  if (text === "") return new Response(null, { status, headers });
  return new Response(text, { status, headers: { "content-type": "application/json", ...headers } });
}

const serialise = (body: unknown) => (body === undefined ? "" : JSON.stringify(body));

/**
 * Runs a write at most once per Idempotency-Key. A repeat with the same key
 * and the same body gets the first answer again; the same key with another
 * body is refused, since it is almost certainly a client bug. Writes without
 * a body (deletes, archiving) pass `body: null`: the scope names the target.
 */
export async function withIdempotency(
  { request, userId, scope, body }: { request: Request; userId: string; scope: string; body: unknown },
  run: () => Promise<{ status: number; body: unknown }>,
): Promise<Response> {
  const key = request.headers.get("idempotency-key");
  if (key === null) {
    const result = await run();
    return answer({ status: result.status, text: serialise(result.body) });
  }
  if (!KEY_PATTERN.test(key)) {
    throw new AppError("bad_request", "Idempotency-Key must be 8–128 letters, digits, '-', '_', ':' or '.'.");
  }
  const requestHash = createHash("sha256").update(serialise(body)).digest("hex");
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
    return answer({ status: record.responseStatus, text: record.responseBody, replayed: true });
  }

  try {
    const result = await run();
    const text = serialise(result.body);
    await completeIdempotencyKey({ ...ref, responseStatus: result.status, responseBody: text });
    return answer({ status: result.status, text });
  } catch (error) {
    // A failed write stores nothing, so the same key may be tried again.
    await releaseIdempotencyKey(ref);
    throw error;
  }
}
