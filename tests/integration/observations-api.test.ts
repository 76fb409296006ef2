import { count, eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";

import { GET as getOne, PUT as putOne } from "@/app/api/v1/observations/[id]/route";
import { GET as list, POST as create } from "@/app/api/v1/observations/route";
import { getDb } from "@/db/client";
import { kCoefficients, observations } from "@/db/schema";

import { apiRequest, enrolStudent, makeUser } from "./support";

type Made = Awaited<ReturnType<typeof makeUser>>;
let alice: Made;
let bob: Made;
let coordinator: Made;
let student: Made;
let otherStudent: Made;

const valid = (instrumentId: string, overrides: Record<string, unknown> = {}) => ({
  observedAt: "2026-03-14T09:30:00Z",
  seeing: 2,
  instrumentId,
  groups: 3,
  spots: 17,
  ...overrides,
});

async function countObservations() {
  const [row] = await getDb().select({ n: count() }).from(observations);
  return row?.n ?? 0;
}

async function post(body: unknown, userId: string | undefined, headers: Record<string, string> = {}) {
  return create(await apiRequest("/api/v1/observations", { method: "POST", userId, body, headers }));
}

beforeAll(async () => {
  alice = await makeUser({ role: "observer", name: "Alice" });
  bob = await makeUser({ role: "observer", name: "Bob" });
  coordinator = await makeUser({ role: "coordinator" });
  const educator = await makeUser({ role: "educator" });
  student = await makeUser({ role: "student" });
  otherStudent = await makeUser({ role: "student" });
  await enrolStudent({ educatorUserId: educator.user.id, studentUserId: student.user.id });
});

describe("POST /api/v1/observations", () => {
  it("stores the observation and answers 201 with its relative number", async () => {
    const res = await post(valid(alice.instrument!.id), alice.user.id);
    expect(res.status).toBe(201);
    const body = await res.json();
    // k is 1.0 before any coefficient is computed: R = 10·3 + 17 = 47.
    expect(body).toMatchObject({
      groups: 3,
      spots: 17,
      k: 1,
      kComputed: false,
      relativeNumber: 47,
      status: "submitted",
      utDate: "2026-03-14",
    });
    expect(body.observerId).toBe(alice.observer!.id);
  });

  it("uses the observer's current k once one is computed", async () => {
    await getDb().insert(kCoefficients).values({
      observerId: bob.observer!.id,
      periodStart: "2025-01-01",
      periodEnd: "2025-12-31",
      k: 0.8,
      sigma: 0.02,
      commonDays: 90,
      method: "ratio-of-sums",
      reference: "test",
    });
    const res = await post(valid(bob.instrument!.id), bob.user.id);
    const body = await res.json();
    // Worked by hand: 0.8 × (10·3 + 17) = 37.6.
    expect(body.relativeNumber).toBeCloseTo(37.6, 10);
    expect(body.kComputed).toBe(true);
  });

  it("stores the hemisphere split when it adds up", async () => {
    const res = await post(
      valid(alice.instrument!.id, { northGroups: 2, northSpots: 11, southGroups: 1, southSpots: 6 }),
      alice.user.id,
    );
    expect(res.status).toBe(201);
    expect(await res.json()).toMatchObject({ northGroups: 2, northSpots: 11, southGroups: 1, southSpots: 6 });
  });

  it("replays the first answer for a repeated Idempotency-Key and stores nothing new", async () => {
    const headers = { "idempotency-key": "retry-test-0001" };
    const first = await post(valid(alice.instrument!.id, { groups: 4, spots: 20 }), alice.user.id, headers);
    const before = await countObservations();
    const second = await post(valid(alice.instrument!.id, { groups: 4, spots: 20 }), alice.user.id, headers);
    expect(first.status).toBe(201);
    expect(second.status).toBe(201);
    expect(second.headers.get("idempotent-replayed")).toBe("true");
    expect((await second.json()).id).toBe((await first.json()).id);
    expect(await countObservations()).toBe(before);
  });

  it("refuses the same Idempotency-Key with a different body", async () => {
    const headers = { "idempotency-key": "retry-test-0002" };
    await post(valid(alice.instrument!.id), alice.user.id, headers);
    const before = await countObservations();
    const res = await post(valid(alice.instrument!.id, { groups: 5, spots: 30 }), alice.user.id, headers);
    expect(res.status).toBe(409);
    expect(await countObservations()).toBe(before);
  });

  const badBodies: Array<[string, (id: string) => unknown, string]> = [
    ["a fractional count", (id) => valid(id, { groups: 2.5 }), "groups"],
    ["a negative count", (id) => valid(id, { spots: -4 }), "spots"],
    ["a count given as a word", (id) => valid(id, { groups: "three" }), "groups"],
    ["fewer spots than groups", (id) => valid(id, { groups: 5, spots: 3 }), "spots"],
    ["spots without groups", (id) => valid(id, { groups: 0, spots: 4 }), "spots"],
    [
      "hemispheres that do not add up",
      (id) => valid(id, { northGroups: 1, northSpots: 5, southGroups: 1, southSpots: 5 }),
      "northGroups",
    ],
    ["only part of the hemisphere split", (id) => valid(id, { northGroups: 1 }), "northSpots"],
    ["an instant in the future", (id) => valid(id, { observedAt: "2999-06-01T10:00:00Z" }), "observedAt"],
    ["an instant before 1610", (id) => valid(id, { observedAt: "1609-12-31T10:00:00Z" }), "observedAt"],
    ["a time that is not an instant", (id) => valid(id, { observedAt: "last Tuesday" }), "observedAt"],
    ["seeing of 0", (id) => valid(id, { seeing: 0 }), "seeing"],
    ["seeing of 6", (id) => valid(id, { seeing: 6 }), "seeing"],
    ["an unknown field", (id) => ({ ...valid(id), weather: "sunny" }), ""],
    [
      "a missing count",
      (id) => ({ observedAt: "2026-03-14T09:30:00Z", seeing: 2, instrumentId: id, groups: 3 }),
      "spots",
    ],
    ["an array instead of an object", () => [1, 2, 3], ""],
  ];

  it.each(badBodies)("answers 400 for %s and stores nothing", async (_label, makeBody, path) => {
    const before = await countObservations();
    const res = await post(makeBody(alice.instrument!.id), alice.user.id);
    expect(res.status).toBe(400);
    const body = await res.json();
    expect(body.error.code).toBe("invalid_input");
    expect(typeof body.error.message).toBe("string");
    expect(body.error.issues.map((i: { path: string }) => i.path)).toContain(path);
    for (const issue of body.error.issues) expect(issue.message.length).toBeGreaterThan(5);
    expect(await countObservations()).toBe(before);
  });

  it("answers 400 for another observer's instrument and stores nothing", async () => {
    const before = await countObservations();
    const res = await post(valid(bob.instrument!.id), alice.user.id);
    expect(res.status).toBe(400);
    const body = await res.json();
    expect(body.error.issues).toEqual([
      { path: "instrumentId", message: expect.stringContaining("not one of yours") },
    ]);
    expect(await countObservations()).toBe(before);
  });

  it("answers 400 for malformed JSON", async () => {
    const res = await post('{"groups": 3,', alice.user.id);
    expect(res.status).toBe(400);
    expect((await res.json()).error.code).toBe("invalid_json");
  });

  it("answers 413 for a body over 64 KB", async () => {
    const before = await countObservations();
    const res = await post(valid(alice.instrument!.id, { notes: "x".repeat(70 * 1024) }), alice.user.id);
    expect(res.status).toBe(413);
    expect((await res.json()).error.code).toBe("payload_too_large");
    expect(await countObservations()).toBe(before);
  });

  it("answers 415 when the body is not JSON", async () => {
    const res = await post("groups=3", alice.user.id, {
      "content-type": "application/x-www-form-urlencoded",
    });
    expect(res.status).toBe(415);
  });

  it("answers 401 when signed out and 403 for a role without a Logbook", async () => {
    const before = await countObservations();
    expect((await post(valid(alice.instrument!.id), undefined)).status).toBe(401);
    const res = await post(valid(alice.instrument!.id), coordinator.user.id);
    expect(res.status).toBe(403);
    expect((await res.json()).error.code).toBe("forbidden");
    expect(await countObservations()).toBe(before);
  });

  it("lets a student log a count of their own", async () => {
    const res = await post(valid(student.instrument!.id, { groups: 1, spots: 1 }), student.user.id);
    expect(res.status).toBe(201);
    // A single spot making a new group counts 11 (common practice: 10·1 + 1).
    expect((await res.json()).relativeNumber).toBe(11);
  });
});

describe("GET /api/v1/observations", () => {
  beforeAll(async () => {
    for (const [day, g, s] of [
      ["2026-01-05", 1, 2],
      ["2026-01-10", 2, 9],
      ["2026-02-01", 3, 12],
    ] as const) {
      await post(
        valid(bob.instrument!.id, { observedAt: `${day}T08:00:00Z`, groups: g, spots: s }),
        bob.user.id,
      );
    }
  });

  it("lists only the caller's observations, newest first, with paging", async () => {
    const res = await list(await apiRequest("/api/v1/observations?pageSize=2", { userId: bob.user.id }));
    expect(res.status).toBe(200);
    const body = await res.json();
    expect(body.total).toBe(4);
    expect(body.data).toHaveLength(2);
    expect(body.data.every((r: { observerId: string }) => r.observerId === bob.observer!.id)).toBe(true);
    expect(body.data[0].observedAt >= body.data[1].observedAt).toBe(true);
  });

  it("sorts oldest first and filters by UT date range", async () => {
    const res = await list(
      await apiRequest("/api/v1/observations?sort=observedAt:asc&from=2026-01-01&to=2026-01-31", {
        userId: bob.user.id,
      }),
    );
    const body = await res.json();
    expect(body.data.map((r: { utDate: string }) => r.utDate)).toEqual(["2026-01-05", "2026-01-10"]);
  });

  it("answers 400 for a bad query", async () => {
    for (const query of [
      "pageSize=1000",
      "from=2026-13-01",
      "from=2026-02-01&to=2026-01-01",
      "sort=groups",
      "colour=red",
    ]) {
      const res = await list(await apiRequest(`/api/v1/observations?${query}`, { userId: bob.user.id }));
      expect(res.status, query).toBe(400);
    }
  });
});

describe("one observation", () => {
  it("is readable and changeable by its owner only; others get 404", async () => {
    const created = await (
      await post(valid(alice.instrument!.id, { groups: 2, spots: 8 }), alice.user.id)
    ).json();
    const url = `/api/v1/observations/${created.id}`;
    const ctx = { params: Promise.resolve({ id: created.id as string }) };

    expect((await getOne(await apiRequest(url, { userId: alice.user.id }), ctx)).status).toBe(200);
    for (const other of [bob, student, otherStudent]) {
      expect((await getOne(await apiRequest(url, { userId: other.user.id }), ctx)).status).toBe(404);
      const put = await putOne(
        await apiRequest(url, { method: "PUT", userId: other.user.id, body: valid(other.instrument!.id) }),
        ctx,
      );
      expect(put.status).toBe(404);
    }

    const changed = await putOne(
      await apiRequest(url, {
        method: "PUT",
        userId: alice.user.id,
        body: valid(alice.instrument!.id, { groups: 2, spots: 9 }),
      }),
      ctx,
    );
    expect(changed.status).toBe(200);
    expect(await changed.json()).toMatchObject({ spots: 9, relativeNumber: 29 });
    const [row] = await getDb().select().from(observations).where(eq(observations.id, created.id));
    expect(row?.spots).toBe(9);
  });

  it("keeps a student's observations from other students", async () => {
    const created = await (
      await post(valid(student.instrument!.id, { groups: 1, spots: 3 }), student.user.id)
    ).json();
    const ctx = { params: Promise.resolve({ id: created.id as string }) };
    const res = await getOne(
      await apiRequest(`/api/v1/observations/${created.id}`, { userId: otherStudent.user.id }),
      ctx,
    );
    expect(res.status).toBe(404);
    const own = await list(await apiRequest("/api/v1/observations", { userId: otherStudent.user.id }));
    expect((await own.json()).total).toBe(0);
  });
});
