import "server-only";

import { and, desc, eq, isNull, lt, or, sql } from "drizzle-orm";

import { getDb } from "../client";
import { apiTokens, rateLimits } from "../schema";

export async function insertApiToken(values: {
  userId: string;
  name: string;
  tokenHash: string;
  prefix: string;
  scope: "read" | "read-submit";
}) {
  const [row] = await getDb()
    .insert(apiTokens)
    .values(values)
    .returning({ id: apiTokens.id, createdAt: apiTokens.createdAt });
  if (!row) throw new Error("insert returned nothing");
  return row;
}

/** A user's tokens, newest first; the secret itself is never stored, only its hash. */
export async function listApiTokensByUser({ userId }: { userId: string }) {
  return getDb()
    .select({
      id: apiTokens.id,
      name: apiTokens.name,
      prefix: apiTokens.prefix,
      scope: apiTokens.scope,
      lastUsedAt: apiTokens.lastUsedAt,
      revokedAt: apiTokens.revokedAt,
      createdAt: apiTokens.createdAt,
    })
    .from(apiTokens)
    .where(eq(apiTokens.userId, userId))
    .orderBy(desc(apiTokens.createdAt));
}

export async function countActiveApiTokens({ userId }: { userId: string }) {
  const rows = await getDb()
    .select({ id: apiTokens.id })
    .from(apiTokens)
    .where(and(eq(apiTokens.userId, userId), isNull(apiTokens.revokedAt)));
  return rows.length;
}

/** Revokes one of the user's own tokens; false when there is no such token of theirs. */
export async function revokeApiTokenOfUser({
  userId,
  tokenId,
}: {
  userId: string;
  tokenId: string;
}): Promise<boolean> {
  const rows = await getDb()
    .update(apiTokens)
    .set({ revokedAt: new Date() })
    .where(and(eq(apiTokens.id, tokenId), eq(apiTokens.userId, userId), isNull(apiTokens.revokedAt)))
    .returning({ id: apiTokens.id });
  return rows.length > 0;
}

export async function findApiTokenByHash({ tokenHash }: { tokenHash: string }) {
  const [row] = await getDb().select().from(apiTokens).where(eq(apiTokens.tokenHash, tokenHash)).limit(1);
  return row ?? null;
}

/** Notes when a token was last used, at most once a minute so reads stay cheap. */
export async function touchApiToken({ tokenId, now }: { tokenId: string; now: Date }) {
  await getDb()
    .update(apiTokens)
    .set({ lastUsedAt: now })
    .where(
      and(
        eq(apiTokens.id, tokenId),
        or(isNull(apiTokens.lastUsedAt), lt(apiTokens.lastUsedAt, new Date(now.getTime() - 60_000))),
      ),
    );
}

/**
 * Counts one request in a fixed window and returns the count so far. One
 * statement, so two requests at once cannot both see the old count.
 */
export async function countInFixedWindow({
  key,
  windowStartedAt,
}: {
  key: string;
  windowStartedAt: Date;
}): Promise<number> {
  const [row] = await getDb()
    .insert(rateLimits)
    .values({ key, windowStartedAt, count: 1 })
    .onConflictDoUpdate({
      target: rateLimits.key,
      set: {
        count: sql`CASE WHEN ${rateLimits.windowStartedAt} = ${windowStartedAt.getTime()} THEN ${rateLimits.count} + 1 ELSE 1 END`,
        windowStartedAt,
      },
    })
    .returning({ count: rateLimits.count });
  return row?.count ?? 1;
}
