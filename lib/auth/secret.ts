import "server-only";

import { randomBytes } from "node:crypto";
import { mkdirSync, readFileSync, writeFileSync } from "node:fs";
import path from "node:path";

import { getEnv } from "@/lib/env";

const SECRET_FILE = path.join(process.cwd(), "data", "auth-secret");

let cached: string | undefined;

// next-auth reads NEXTAUTH_URL itself (to build links and to pick the cookie
// name); default it to this server so a fresh install needs no env file.
process.env.NEXTAUTH_URL ??= `http://localhost:${getEnv().PORT}`;

/**
 * The key that signs session cookies. Taken from NEXTAUTH_SECRET when set
 * (required when several machines serve the same network); otherwise made
 * once and kept beside the embedded database, so a fresh install needs no
 * environment file and sessions survive restarts.
 */
export function getAuthSecret(): string {
  if (cached) return cached;
  const fromEnv = getEnv().NEXTAUTH_SECRET;
  if (fromEnv) return (cached = fromEnv);
  try {
    cached = readFileSync(SECRET_FILE, "utf8").trim();
    if (cached.length >= 32) return cached;
  } catch {
    // not made yet
  }
  mkdirSync(path.dirname(SECRET_FILE), { recursive: true });
  const made = randomBytes(32).toString("base64url");
  try {
    writeFileSync(SECRET_FILE, made, { flag: "wx", mode: 0o600 });
    cached = made;
  } catch {
    // Another process wrote it first; use theirs.
    cached = readFileSync(SECRET_FILE, "utf8").trim();
  }
  return cached;
}
