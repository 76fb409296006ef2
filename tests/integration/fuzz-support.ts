/**
 * The pieces shared by the fuzz tests of the write routes: a seeded
 * generator, a fingerprint of the whole database, corruptions of the JSON
 * text itself, and the one assertion every refusal must pass.
 */
import { createHash } from "node:crypto";

import { expect } from "vitest";

import { getDb } from "@/db/client";
import { errorBodySchema } from "@/lib/api/schemas";

import { sessionCookie } from "./support";

/** mulberry32: a small, well-known seeded generator (common practice for reproducible tests). */
export function createRandom(seed: number) {
  let a = seed >>> 0;
  const next = () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  const int = (min: number, max: number) => min + Math.floor(next() * (max - min + 1));
  const pick = <T>(items: readonly T[]): T => items[int(0, items.length - 1)]!;
  return { next, int, pick };
}
export type Random = ReturnType<typeof createRandom>;

/** A fingerprint of every table: row counts and a hash of every row, in rowid order. */
export async function fingerprintDatabase(): Promise<Record<string, string>> {
  const client = getDb().$client;
  const tables = await client.execute(
    "SELECT name FROM sqlite_master WHERE type = 'table' AND name NOT LIKE 'sqlite_%' AND name NOT LIKE '__drizzle%' ORDER BY name",
  );
  const out: Record<string, string> = {};
  for (const row of tables.rows) {
    const name = String(row.name);
    // Requests signed with a token count against its rate limit and note its
    // last use: bookkeeping of the request, not data it tried to store.
    if (name === "rate_limits") continue;
    const select =
      name === "api_tokens"
        ? "SELECT id, user_id, name, token_hash, prefix, scope, revoked_at FROM api_tokens"
        : `SELECT * FROM "${name}"`;
    const rows = await client.execute(`${select} ORDER BY rowid`);
    const hash = createHash("sha256");
    for (const r of rows.rows)
      hash.update(
        JSON.stringify(Array.from(r as ArrayLike<unknown>, (v) => (typeof v === "bigint" ? String(v) : v))),
      );
    out[name] = `${rows.rows.length}:${hash.digest("hex").slice(0, 16)}`;
  }
  return out;
}

/**
 * Breaks the JSON text itself, or the request around it. Valid bodies given
 * here must keep ':' and ',' out of free text, so that replacing one of them
 * can never leave a request that is still valid.
 */
export function corruptRequestText(
  random: Random,
  { text, maxBytes }: { text: string; maxBytes: number },
): { text: string; contentType?: string } {
  switch (random.int(0, 5)) {
    case 0:
      return { text: text.slice(0, random.int(1, text.length - 2)) };
    case 1: {
      const structural = [...text.matchAll(/[{}":,]/g)].map((m) => m.index!);
      const at = random.pick(structural);
      return { text: `${text.slice(0, at)}${random.pick(["x", "]", "\\", "\u0000"])}${text.slice(at + 1)}` };
    }
    case 2:
      return {
        text: String.fromCharCode(...Array.from({ length: random.int(1, 200) }, () => random.int(0, 255))),
      };
    case 3:
      return {
        text,
        contentType: random.pick(["text/plain", "application/x-www-form-urlencoded", "text/csv", ""]),
      };
    case 4:
      // Over the route's size limit, whatever the schema would make of it.
      return { text: JSON.stringify({ padding: "x".repeat(maxBytes + 1), ...JSON.parse(text) }) };
    default:
      return { text: "" };
  }
}

/** A corrupted body as text: most often a broken value, otherwise broken JSON. */
export function buildJsonCase(
  random: Random,
  {
    valid,
    corrupt,
    maxBytes,
  }: {
    valid: () => Record<string, unknown>;
    corrupt: (random: Random, body: Record<string, unknown>) => unknown;
    maxBytes: number;
  },
): { text: string; contentType: string } {
  if (random.next() < 0.7) {
    const body = corrupt(random, valid());
    return { text: body === undefined ? "" : JSON.stringify(body), contentType: "application/json" };
  }
  const broken = corruptRequestText(random, { text: JSON.stringify(valid()), maxBytes });
  return { text: broken.text, contentType: broken.contentType ?? "application/json" };
}

export function idempotencyHeader(random: Random): Record<string, string> {
  const roll = random.next();
  if (roll < 0.3) return { "idempotency-key": `fuzz-${random.int(0, 1e9)}` };
  if (roll < 0.4)
    return {
      "idempotency-key": random.pick(["short", "with space in it", "ü-not-ascii-key", "x".repeat(200)]),
    };
  return {};
}

/** A JSON request signed in as the user, with the text sent as it is. */
export async function buildJsonRequest({
  url,
  method,
  userId,
  text,
  contentType,
  headers = {},
}: {
  url: string;
  method: string;
  userId: string;
  text: string;
  contentType: string;
  headers?: Record<string, string>;
}): Promise<Request> {
  return new Request(new URL(url, "http://localhost:3999"), {
    method,
    headers: {
      cookie: await sessionCookie(userId),
      ...headers,
      ...(contentType ? { "content-type": contentType } : {}),
    },
    body: text === "" ? undefined : text,
  });
}

/** A 4xx (never 2xx, never 5xx) whose body is { error: { code, message } }; answers the code. */
export async function expectRefusal(res: Response, label: string): Promise<string> {
  const text = await res.text();
  expect(res.status, `${label}: ${text.slice(0, 300)}`).toBeGreaterThanOrEqual(400);
  expect(res.status, `${label}: ${text.slice(0, 300)}`).toBeLessThan(500);
  const parsed = errorBodySchema.safeParse(JSON.parse(text));
  expect(parsed.success, `${label}: ${text.slice(0, 300)}`).toBe(true);
  return parsed.data?.error.code ?? "";
}
