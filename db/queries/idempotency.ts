import "server-only";

import { and, eq } from "drizzle-orm";

import { getDb } from "../client";
import { idempotencyKeys } from "../schema";

type KeyRef = { userId: string; scope: string; key: string };

const matches = (ref: KeyRef) =>
  and(
    eq(idempotencyKeys.userId, ref.userId),
    eq(idempotencyKeys.scope, ref.scope),
    eq(idempotencyKeys.key, ref.key),
  );

export async function findIdempotencyRecord(ref: KeyRef) {
  const [row] = await getDb().select().from(idempotencyKeys).where(matches(ref)).limit(1);
  return row ?? null;
}

/**
 * Claims a key before the write runs (status 0 = in progress). Only one of
 * two racing requests with the same key wins the claim.
 */
export async function claimIdempotencyKey(ref: KeyRef & { requestHash: string }): Promise<boolean> {
  const inserted = await getDb()
    .insert(idempotencyKeys)
    .values({ ...ref, responseStatus: 0, responseBody: "" })
    .onConflictDoNothing()
    .returning({ key: idempotencyKeys.key });
  return inserted.length > 0;
}

export async function completeIdempotencyKey(ref: KeyRef & { responseStatus: number; responseBody: string }) {
  await getDb()
    .update(idempotencyKeys)
    .set({ responseStatus: ref.responseStatus, responseBody: ref.responseBody })
    .where(matches(ref));
}

export async function releaseIdempotencyKey(ref: KeyRef) {
  await getDb().delete(idempotencyKeys).where(matches(ref));
}
