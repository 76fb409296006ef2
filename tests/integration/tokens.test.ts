import { count, eq } from "drizzle-orm";
import { afterEach, beforeAll, describe, expect, it, vi } from "vitest";

import { POST as importRoute } from "@/app/api/v1/imports/route";
import { GET as list, POST as create } from "@/app/api/v1/observations/route";
import { getDb } from "@/db/client";
import { insertApiToken, listApiTokensByUser, revokeApiTokenOfUser } from "@/db/queries/api-tokens";
import { apiTokens, observations, users } from "@/db/schema";
import { generateApiToken, hashApiToken } from "@/lib/auth/api-token";
import { resetEnvCache } from "@/lib/env";

import { apiRequest, makeUser, sessionCookie } from "./support";

// A small limit keeps the rate-limit test short; set before the env is first read.
process.env.API_RATE_LIMIT_PER_MINUTE = "5";
resetEnvCache();

type Made = Awaited<ReturnType<typeof makeUser>>;
let alice: Made;
let bob: Made;

async function mintToken(userId: string, scope: "read" | "read-submit") {
  const { token, prefix, tokenHash } = generateApiToken();
  const row = await insertApiToken({ userId, name: `${scope} token`, scope, prefix, tokenHash });
  return { token, id: row.id };
}

const bearer = (token: string) => ({ authorization: `Bearer ${token}` });

const valid = (instrumentId: string) => ({
  observedAt: "2026-03-14T09:30:00Z",
  seeing: 2,
  instrumentId,
  groups: 3,
  spots: 17,
});

async function countObservations() {
  const [row] = await getDb().select({ n: count() }).from(observations);
  return row?.n ?? 0;
}

beforeAll(async () => {
  alice = await makeUser({ role: "observer", name: "Alice" });
  bob = await makeUser({ role: "observer", name: "Bob" });
});

afterEach(() => {
  vi.useRealTimers();
});

describe("API tokens", () => {
  it("are stored only as a SHA-256 hash with a short prefix", async () => {
    const { token, id } = await mintToken(alice.user.id, "read");
    const [row] = await getDb().select().from(apiTokens).where(eq(apiTokens.id, id));
    expect(token).toMatch(/^htk_[A-Za-z0-9_-]{43}$/);
    expect(row!.tokenHash).toBe(hashApiToken(token));
    expect(row!.tokenHash).not.toContain(token.slice(4));
    expect(token.startsWith(row!.prefix)).toBe(true);
    expect(row!.prefix.length).toBeLessThan(12);
  });

  it("let a script read with the same rules as the session (own data only)", async () => {
    await create(
      await apiRequest("/api/v1/observations", {
        method: "POST",
        userId: alice.user.id,
        body: valid(alice.instrument!.id),
      }),
    );
    const { token } = await mintToken(bob.user.id, "read");
    const res = await list(await apiRequest("/api/v1/observations", { headers: bearer(token) }));
    expect(res.status).toBe(200);
    const body = await res.json();
    // Bob's token sees Bob's Logbook (empty), never Alice's count.
    expect(body.total).toBe(0);
    const [row] = await getDb()
      .select()
      .from(apiTokens)
      .where(eq(apiTokens.tokenHash, hashApiToken(token)));
    expect(row!.lastUsedAt).not.toBeNull();
  });

  it("with the read-and-submit scope may write, and Idempotency-Key is honoured", async () => {
    const { token } = await mintToken(alice.user.id, "read-submit");
    const before = await countObservations();
    const send = async () =>
      create(
        await apiRequest("/api/v1/observations", {
          method: "POST",
          body: { ...valid(alice.instrument!.id), observedAt: "2026-03-15T09:30:00Z" },
          headers: { ...bearer(token), "idempotency-key": "token-write-0001" },
        }),
      );
    const first = await send();
    const again = await send();
    expect(first.status).toBe(201);
    expect((await first.json()).source).toBe("api");
    expect(again.headers.get("idempotent-replayed")).toBe("true");
    expect(await countObservations()).toBe(before + 1);
  });

  it("with the read scope is refused on a write (403) and stores nothing", async () => {
    const { token } = await mintToken(alice.user.id, "read");
    const before = await countObservations();
    const res = await create(
      await apiRequest("/api/v1/observations", {
        method: "POST",
        body: valid(alice.instrument!.id),
        headers: bearer(token),
      }),
    );
    expect(res.status).toBe(403);
    expect((await res.json()).error).toMatchObject({
      code: "forbidden",
      message: expect.stringContaining("may only read"),
    });
    const imported = await importRoute(
      await apiRequest(
        `/api/v1/imports?date=1&groups=2&spots=3&dateFormat=yyyy-mm-dd&defaultSeeing=2&instrumentId=${alice.instrument!.id}`,
        {
          method: "POST",
          body: "date,g,s\n2010-01-01,1,1\n",
          headers: { ...bearer(token), "content-type": "text/csv" },
        },
      ),
    );
    expect(imported.status).toBe(403);
    expect(await countObservations()).toBe(before);
  });

  it.each([
    ["an unknown token", "Bearer htk_" + "A".repeat(43), /not recognised/],
    ["a value that is not one of our tokens", "Bearer not-a-token", /not recognised/],
    ["another scheme", "Basic YWxpY2U6cGFzc3dvcmQ=", /Authorization: Bearer/],
  ])("answer 401 with a clear message for %s", async (_name, header, message) => {
    const res = await list(await apiRequest("/api/v1/observations", { headers: { authorization: header } }));
    expect(res.status).toBe(401);
    expect(res.headers.get("www-authenticate")).toContain("Bearer");
    expect((await res.json()).error.message).toMatch(message);
  });

  it("never hand a bearer value to the session check, even a valid session JWT", async () => {
    const jwt = (await sessionCookie(alice.user.id)).split("=")[1]!;
    const res = await list(
      await apiRequest("/api/v1/observations", { headers: { authorization: `Bearer ${jwt}` } }),
    );
    expect(res.status).toBe(401);
  });

  it("do not fall back to the session cookie when the token is bad", async () => {
    const res = await list(
      await apiRequest("/api/v1/observations", {
        userId: alice.user.id,
        headers: { authorization: "Bearer htk_wrong" },
      }),
    );
    expect(res.status).toBe(401);
  });

  it("stop working the moment they are revoked (401)", async () => {
    const { token, id } = await mintToken(alice.user.id, "read-submit");
    expect((await list(await apiRequest("/api/v1/observations", { headers: bearer(token) }))).status).toBe(
      200,
    );
    // Only the owner can revoke: Bob's attempt finds nothing.
    expect(await revokeApiTokenOfUser({ userId: bob.user.id, tokenId: id })).toBe(false);
    expect(await revokeApiTokenOfUser({ userId: alice.user.id, tokenId: id })).toBe(true);
    const res = await list(await apiRequest("/api/v1/observations", { headers: bearer(token) }));
    expect(res.status).toBe(401);
    expect((await res.json()).error.message).toMatch(/was revoked on \d{4}-\d{2}-\d{2}/);
    const listed = await listApiTokensByUser({ userId: alice.user.id });
    expect(listed.find((t) => t.id === id)?.revokedAt).not.toBeNull();
  });

  it("follow the account: a disabled account's token is refused", async () => {
    const carol = await makeUser({ role: "observer", name: "Carol" });
    const { token } = await mintToken(carol.user.id, "read");
    await getDb().update(users).set({ disabledAt: new Date() }).where(eq(users.id, carol.user.id));
    const res = await list(await apiRequest("/api/v1/observations", { headers: bearer(token) }));
    expect(res.status).toBe(401);
  });

  it("are rate limited per token with 429 and Retry-After", async () => {
    vi.useFakeTimers({ toFake: ["Date"] });
    vi.setSystemTime(new Date("2031-05-01T10:00:15Z"));
    const { token } = await mintToken(alice.user.id, "read");
    const other = await mintToken(alice.user.id, "read");
    const statuses: number[] = [];
    for (let i = 0; i < 6; i++) {
      statuses.push(
        (await list(await apiRequest("/api/v1/observations", { headers: bearer(token) }))).status,
      );
    }
    expect(statuses).toEqual([200, 200, 200, 200, 200, 429]);
    const limited = await list(await apiRequest("/api/v1/observations", { headers: bearer(token) }));
    expect(limited.status).toBe(429);
    // 45 s remain in the minute that started at 10:00:00.
    expect(limited.headers.get("retry-after")).toBe("45");
    expect((await limited.json()).error.code).toBe("rate_limited");
    // Another token of the same user has its own window.
    expect(
      (await list(await apiRequest("/api/v1/observations", { headers: bearer(other.token) }))).status,
    ).toBe(200);
    // The next window starts afresh.
    vi.setSystemTime(new Date("2031-05-01T10:01:00Z"));
    expect((await list(await apiRequest("/api/v1/observations", { headers: bearer(token) }))).status).toBe(
      200,
    );
  });

  it("are refused to students", async () => {
    const student = await makeUser({ role: "student" });
    const { token } = await mintToken(student.user.id, "read");
    const res = await list(await apiRequest("/api/v1/observations", { headers: bearer(token) }));
    expect(res.status).toBe(403);
  });
});
