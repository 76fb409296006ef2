import "server-only";

import { createHash, randomBytes } from "node:crypto";

import { countInFixedWindow, findApiTokenByHash, touchApiToken } from "@/db/queries/api-tokens";
import { getUserById } from "@/db/queries/users";
import { getEnv } from "@/lib/env";
import { AppError } from "@/lib/http/errors";
import type { ApiTokenScope } from "@/lib/validation/api-token";

import type { SessionUser } from "./session";

/** Our tokens start with this, so a leaked one is easy to recognise (and to search for in code). */
export const API_TOKEN_PREFIX = "htk_";
const TOKEN_PATTERN = /^htk_[A-Za-z0-9_-]{43}$/;
const SAFE_METHODS = new Set(["GET", "HEAD", "OPTIONS"]);
const RATE_WINDOW_MS = 60_000;

export function hashApiToken(token: string): string {
  return createHash("sha256").update(token).digest("hex");
}

/** A new secret (256 random bits), the part of it we keep to tell tokens apart, and its hash. */
export function generateApiToken(): { token: string; prefix: string; tokenHash: string } {
  const token = `${API_TOKEN_PREFIX}${randomBytes(32).toString("base64url")}`;
  return { token, prefix: token.slice(0, API_TOKEN_PREFIX.length + 6), tokenHash: hashApiToken(token) };
}

const unauthenticated = (message: string) =>
  new AppError("unauthenticated", message, { headers: { "WWW-Authenticate": 'Bearer realm="heliotally"' } });

/**
 * The caller named by `Authorization: Bearer <token>`, or null when the
 * request carries no Authorization header (then the session cookie decides).
 * A header that is present but wrong never falls back to the cookie: the
 * client meant to use a token, and should hear why it failed.
 */
export async function authenticateApiToken({ request }: { request: Request }): Promise<SessionUser | null> {
  const header = request.headers.get("authorization");
  if (header === null) return null;
  const match = /^Bearer\s+(\S+)\s*$/i.exec(header.trim());
  if (!match) {
    throw unauthenticated(
      "Send an API token as “Authorization: Bearer <token>”. Create one under Account → API tokens.",
    );
  }
  const secret = match[1] ?? "";
  const token = TOKEN_PATTERN.test(secret)
    ? await findApiTokenByHash({ tokenHash: hashApiToken(secret) })
    : null;
  if (!token) {
    throw unauthenticated(
      "This API token is not recognised. Check that it was copied whole, or create a new one under Account → API tokens.",
    );
  }
  if (token.revokedAt) {
    throw unauthenticated(
      `This API token (${token.prefix}…) was revoked on ${token.revokedAt.toISOString().slice(0, 10)}. Create a new one under Account → API tokens.`,
    );
  }
  const user = await getUserById({ userId: token.userId });
  if (!user || user.disabledAt) throw unauthenticated("The account this API token belongs to is disabled.");
  if (user.role === "student") throw new AppError("forbidden", "Student accounts cannot use API tokens.");

  const now = new Date();
  await enforceRateLimit({ tokenId: token.id, now });
  if (token.scope === "read" && !SAFE_METHODS.has(request.method.toUpperCase())) {
    throw new AppError(
      "forbidden",
      "This API token may only read. Create a token with the “read and submit” scope to send data.",
    );
  }
  await touchApiToken({ tokenId: token.id, now });
  return {
    id: user.id,
    name: user.name,
    email: user.email,
    role: user.role,
    apiToken: { id: token.id, scope: token.scope as ApiTokenScope },
  };
}

async function enforceRateLimit({ tokenId, now }: { tokenId: string; now: Date }) {
  const limit = getEnv().API_RATE_LIMIT_PER_MINUTE;
  const windowStart = Math.floor(now.getTime() / RATE_WINDOW_MS) * RATE_WINDOW_MS;
  const used = await countInFixedWindow({
    key: `api-token:${tokenId}`,
    windowStartedAt: new Date(windowStart),
  });
  if (used > limit) {
    const retryAfterS = Math.max(1, Math.ceil((windowStart + RATE_WINDOW_MS - now.getTime()) / 1000));
    throw new AppError(
      "rate_limited",
      `Too many requests with this API token: the limit is ${limit} a minute. Try again in ${retryAfterS} s.`,
      { headers: { "Retry-After": String(retryAfterS) } },
    );
  }
}
