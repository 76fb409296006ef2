import "server-only";

import { getToken } from "next-auth/jwt";
import { cookies, headers } from "next/headers";
import { NextRequest } from "next/server";

import { getObserverByUserId } from "@/db/queries/observers";
import { getSessionIdentity } from "@/db/queries/users";
import { AppError } from "@/lib/http/errors";
import type { ApiTokenScope } from "@/lib/validation/api-token";

import { authenticateApiToken } from "./api-token";
import { roleSatisfies, type Role } from "./roles";
import { getAuthSecret } from "./secret";

export type SessionUser = {
  id: string;
  name: string | null;
  email: string | null;
  role: Role;
  /** Set when the caller signed the request with an API token instead of the session cookie. */
  apiToken?: { id: string; scope: ApiTokenScope };
};

/**
 * Who is calling. Route handlers pass their request; server components and
 * server actions pass nothing and the request's cookies are read instead.
 * The token only names the user: the role always comes from the database.
 */
export async function getSessionUser({ request }: { request?: Request } = {}): Promise<SessionUser | null> {
  // API tokens count only for route handlers (which pass their request);
  // pages and server actions answer to the browser's session cookie alone.
  if (request) {
    const viaToken = await authenticateApiToken({ request });
    if (viaToken) return viaToken;
  }
  const userId = await readSessionUserId(request);
  if (!userId) return null;
  const user = await getSessionIdentity({ userId });
  if (!user || user.disabledAt) return null;
  return { id: user.id, name: user.name, email: user.email, role: user.role };
}

// Decoding the session cookie (key derivation and decryption) costs more
// than the user lookup that follows; the same cookie always decodes to the
// same user until it expires, so remember it briefly. The role and disabled
// flag are still read from the database on every request.
const DECODED_TTL_MS = 60_000;
const DECODED_MAX = 1_000;
const decoded = new Map<string, { userId: string | null; until: number }>();

/** The user id in the session cookie; the request copy next-auth wants is only built for a new cookie. */
async function readSessionUserId(request: Request | undefined): Promise<string | null> {
  const cookie = request ? (request.headers.get("cookie") ?? "") : await readContextCookie();
  if (!cookie.includes("session-token")) return null;
  const now = Date.now();
  const hit = decoded.get(cookie);
  if (hit && hit.until > now) return hit.userId;
  const req = request ? toNextRequest(request) : await requestFromContext();
  const token = await getToken({ req, secret: getAuthSecret() });
  const userId = typeof token?.sub === "string" ? token.sub : null;
  const expiresAt = typeof token?.exp === "number" ? token.exp * 1000 : now + DECODED_TTL_MS;
  if (decoded.size >= DECODED_MAX) decoded.delete(decoded.keys().next().value as string);
  decoded.set(cookie, { userId, until: Math.min(now + DECODED_TTL_MS, expiresAt) });
  return userId;
}

/**
 * The one guard. Every server action and route handler calls it first;
 * it throws AppError("unauthenticated" | "forbidden") which route handlers
 * turn into 401/403 and pages into a redirect or the 403 page.
 */
export async function requireRole(
  roles: readonly Role[],
  { request }: { request?: Request } = {},
): Promise<SessionUser> {
  const user = await getSessionUser({ request });
  if (!user) throw new AppError("unauthenticated", "Sign in to continue.");
  if (!roleSatisfies({ role: user.role, required: roles })) {
    throw new AppError("forbidden", "Your account does not have access to this.");
  }
  return user;
}

/** For roles that keep a Logbook: the guard plus the caller's observer profile. */
export async function requireObserver(
  roles: readonly Role[] = ["observer", "student"],
  { request }: { request?: Request } = {},
) {
  const user = await requireRole(roles, { request });
  const observer = await getObserverByUserId({ userId: user.id });
  if (!observer) throw new AppError("forbidden", "Your account has no observer profile.");
  return { user, observer };
}

/**
 * getToken wants a NextRequest. Copy only the URL and headers: building one
 * from the request itself would lock its body, which the handler still reads.
 */
function toNextRequest(request: Request): NextRequest {
  return new NextRequest(request.url, { headers: withoutAuthorization(request.headers) });
}

/**
 * getToken would also read a JWT from `Authorization: Bearer`. Our API
 * tokens are not JWTs and are checked above; keep that header away from it.
 */
function withoutAuthorization(source: Headers): Headers {
  const headers = new Headers(source);
  headers.delete("authorization");
  return headers;
}

async function readContextCookie(): Promise<string> {
  return (await cookies()).toString();
}

async function requestFromContext(): Promise<NextRequest> {
  const [cookieStore, headerStore] = await Promise.all([cookies(), headers()]);
  const h = withoutAuthorization(new Headers(headerStore));
  h.set("cookie", cookieStore.toString());
  return new NextRequest("http://localhost/", { headers: h });
}
