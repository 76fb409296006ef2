import { asc, count, eq, inArray } from "drizzle-orm";
import { afterAll, beforeAll, beforeEach, describe, expect, it, vi } from "vitest";

import { PUT as putObservation } from "@/app/api/v1/observations/[id]/route";
import { POST as postObservation } from "@/app/api/v1/observations/route";
import { GET as getDecisionLog, POST as postDecision } from "@/app/api/v1/review/decisions/route";
import { GET as getQueue } from "@/app/api/v1/review/queue/route";
import { getDb } from "@/db/client";
import { listCapturedMail } from "@/db/queries/mail";
import { listUnreadNotifications, markNotificationsReadByLink } from "@/db/queries/notifications";
import { findNextAwaitingReview } from "@/db/queries/review";
import { flagAwaitingReview, setOutlierThreshold } from "@/db/queries/review-flags";
import { refreshSeriesForDays } from "@/db/queries/series";
import { kCoefficients, notifications, observationFlags, observations, reviewDecisions } from "@/db/schema";
import { resetEnvCache } from "@/lib/env";
import { startMailSink } from "@/lib/mail/sink";

import { apiRequest, makeUser } from "./support";

// The series feature owns this module; here we only check that the Review
// desk asks for the right days to be refreshed.
vi.mock("@/db/queries/series", () => ({ refreshSeriesForDays: vi.fn(async () => {}) }));
const refreshSpy = vi.mocked(refreshSeriesForDays);

type Made = Awaited<ReturnType<typeof makeUser>>;
let coordinator: Made;
let admin: Made;
let educator: Made;
let student: Made;
let alice: Made;
let bob: Made;
let carol: Made;
let dave: Made;
let sink: Awaited<ReturnType<typeof startMailSink>>;

const DAY = "2026-03-14";

async function logCount(who: Made, values: Record<string, unknown>) {
  const res = await postObservation(
    await apiRequest("/api/v1/observations", {
      method: "POST",
      userId: who.user.id,
      body: { observedAt: `${DAY}T09:30:00Z`, seeing: 2, instrumentId: who.instrument!.id, ...values },
    }),
  );
  expect(res.status).toBe(201);
  return (await res.json()) as { id: string };
}

async function queue(query: string, userId = coordinator.user.id) {
  return getQueue(await apiRequest(`/api/v1/review/queue?${query}`, { userId }));
}

async function decide(body: unknown, userId = coordinator.user.id) {
  return postDecision(await apiRequest("/api/v1/review/decisions", { method: "POST", userId, body }));
}

async function statusOf(ids: string[]) {
  const rows = await getDb()
    .select({ id: observations.id, status: observations.status })
    .from(observations)
    .where(inArray(observations.id, ids));
  return Object.fromEntries(rows.map((r) => [r.id, r.status]));
}

async function decisionsOf(id: string) {
  return getDb()
    .select()
    .from(reviewDecisions)
    .where(eq(reviewDecisions.observationId, id))
    .orderBy(asc(reviewDecisions.createdAt), asc(reviewDecisions.id));
}

async function countRows(table: typeof reviewDecisions | typeof notifications) {
  const [row] = await getDb().select({ n: count() }).from(table);
  return row?.n ?? 0;
}

async function flagsOf(id: string) {
  return getDb().select().from(observationFlags).where(eq(observationFlags.observationId, id));
}

// Counts logged on DAY: four ordinary observers and one slipped digit.
const ids: Record<string, string> = {};

beforeAll(async () => {
  sink = await startMailSink({ port: 0 });
  process.env.SMTP_PORT = String(sink.port);
  resetEnvCache();

  coordinator = await makeUser({ role: "coordinator", name: "Coordinator Quill" });
  admin = await makeUser({ role: "admin" });
  educator = await makeUser({ role: "educator" });
  student = await makeUser({ role: "student" });
  alice = await makeUser({ role: "observer", name: "Alice" });
  bob = await makeUser({ role: "observer", name: "Bob" });
  carol = await makeUser({ role: "observer", name: "Carol" });
  dave = await makeUser({ role: "observer", name: "Dave" });

  ids.bob = (await logCount(bob, { groups: 4, spots: 20 })).id; // 60
  ids.carol = (await logCount(carol, { groups: 3, spots: 15 })).id; // 45
  ids.dave = (await logCount(dave, { groups: 5, spots: 25 })).id; // 75
  ids.alice = (await logCount(alice, { groups: 3, spots: 17 })).id; // 47
  // A slipped digit: 170 for 17. Scaled 200 against the others' median 53.5.
  ids.typo = (await logCount(alice, { observedAt: `${DAY}T11:00:00Z`, groups: 3, spots: 170 })).id;
});

afterAll(async () => {
  await sink.close();
});

beforeEach(() => {
  refreshSpy.mockClear();
});

describe("automatic flags on arrival", () => {
  it("flags a count far from the day's network and a second count the same day", async () => {
    const flags = await flagsOf(ids.typo!);
    expect(flags.map((f) => f.reason).sort()).toEqual(["far-from-network", "second-of-the-day"]);
    expect(flags.find((f) => f.reason === "far-from-network")?.detail).toMatch(
      /Scaled value 200\.0 .* above the day's network median of 60\.0/,
    );
    // The earlier of the two became half of a pair when the second arrived.
    expect((await flagsOf(ids.alice!)).map((f) => f.reason)).toEqual(["second-of-the-day"]);
    // The ordinary counts were judged against the few others there were when they arrived.
    expect(await flagsOf(ids.bob!)).toEqual([]);
    expect(await flagsOf(ids.carol!)).toEqual([]);
  });

  it("flags an unusual s/g against the observer's own accepted history", async () => {
    const fresh = await makeUser({ role: "observer", name: "Fern" });
    const history = Array.from({ length: 12 }, (_, i) => ({
      observerId: fresh.observer!.id,
      instrumentId: fresh.instrument!.id,
      observedAt: new Date(Date.UTC(2026, 1, i + 1, 9)),
      utDate: `2026-02-${String(i + 1).padStart(2, "0")}`,
      seeing: 2,
      groups: 6,
      spots: 30 + (i % 3),
      status: "accepted" as const,
    }));
    await getDb().insert(observations).values(history);
    const { id } = await logCount(fresh, { observedAt: "2026-03-01T09:00:00Z", groups: 6, spots: 300 });
    const flags = await flagsOf(id);
    expect(flags.map((f) => f.reason)).toEqual(["unusual-spots-per-group"]);
    expect(flags[0]?.detail).toContain("s/g = 50.0 against a usual 5.2");
  });

  it("flags legacy rows whose hemispheres do not add up, when the waiting counts are checked", async () => {
    const legacy = await makeUser({ role: "observer" });
    const [row] = await getDb()
      .insert(observations)
      .values({
        observerId: legacy.observer!.id,
        instrumentId: legacy.instrument!.id,
        observedAt: new Date("2026-03-02T09:00:00Z"),
        utDate: "2026-03-02",
        seeing: 3,
        groups: 4,
        spots: 20,
        northGroups: 1,
        northSpots: 5,
        southGroups: 1,
        southSpots: 5,
        source: "import",
      })
      .returning();
    await flagAwaitingReview();
    const flags = await flagsOf(row!.id);
    expect(flags.map((f) => f.reason)).toEqual(["hemispheres-inconsistent"]);
    expect(flags[0]?.detail).toContain("1 + 1 = 2, but the total is 4");
    // Re-checking is idempotent: still one flag per reason.
    await flagAwaitingReview();
    expect(await flagsOf(row!.id)).toHaveLength(1);
  });

  it("follows the configured threshold", async () => {
    await setOutlierThreshold({ value: 10 });
    await flagAwaitingReview();
    expect((await flagsOf(ids.typo!)).map((f) => f.reason)).toEqual(["second-of-the-day"]);
    await setOutlierThreshold({ value: 3 });
    await flagAwaitingReview();
    expect((await flagsOf(ids.typo!)).map((f) => f.reason).sort()).toEqual([
      "far-from-network",
      "second-of-the-day",
    ]);
    expect((await flagsOf(ids.alice!)).map((f) => f.reason)).toEqual(["second-of-the-day"]);
  });
});

describe("GET /api/v1/review/queue", () => {
  it("lists waiting counts with k, the scaled value, the day's network value and flags", async () => {
    const res = await queue(`from=${DAY}&to=${DAY}&sort=observedAt:asc`);
    expect(res.status).toBe(200);
    const body = await res.json();
    expect(body.total).toBe(5);
    expect(body.counts.submitted).toBeGreaterThanOrEqual(5);
    const typo = body.data.find((r: { id: string }) => r.id === ids.typo);
    // k is 1 until one is computed; the network is the other observers' median: (45 + 60 + 75) → 60.
    expect(typo).toMatchObject({
      observerName: "Alice",
      groups: 3,
      spots: 170,
      k: 1,
      scaledValue: 200,
      network: { median: 60, n: 3 },
    });
    expect(typo.flags.map((f: { reason: string }) => f.reason).sort()).toEqual([
      "far-from-network",
      "second-of-the-day",
    ]);
  });

  it("scales each count by its observer's current k for that instrument", async () => {
    await getDb().insert(kCoefficients).values({
      observerId: bob.observer!.id,
      instrumentId: bob.instrument!.id,
      periodStart: "2025-01-01",
      periodEnd: "2025-12-31",
      k: 0.8,
      commonDays: 90,
      method: "ratio-of-sums",
      reference: "test",
    });
    const body = await (await queue(`observerId=${bob.observer!.id}`)).json();
    // Worked by hand: 0.8 × (10·4 + 20) = 48.
    expect(body.data[0]).toMatchObject({ k: 0.8 });
    expect(body.data[0].scaledValue).toBeCloseTo(48, 10);
    await getDb().delete(kCoefficients).where(eq(kCoefficients.observerId, bob.observer!.id));
  });

  it("filters by flag reason, observer and date, and sorts by observer", async () => {
    const flagged = await (await queue(`from=${DAY}&to=${DAY}&flag=far-from-network`)).json();
    expect(flagged.data.map((r: { id: string }) => r.id)).toEqual([ids.typo]);
    const unflagged = await (await queue(`from=${DAY}&to=${DAY}&flag=none`)).json();
    expect(unflagged.data.map((r: { id: string }) => r.id).sort()).toEqual(
      [ids.bob, ids.carol, ids.dave].sort(),
    );
    const byObserver = await (await queue(`observerId=${bob.observer!.id}`)).json();
    expect(byObserver.data.map((r: { id: string }) => r.id)).toEqual([ids.bob]);
    const outside = await (await queue("from=2020-01-01&to=2020-01-31")).json();
    expect(outside).toMatchObject({ total: 0, data: [] });
    const sorted = await (await queue(`from=${DAY}&to=${DAY}&sort=observer:asc`)).json();
    expect(sorted.data.map((r: { observerName: string }) => r.observerName)).toEqual([
      "Alice",
      "Alice",
      "Bob",
      "Carol",
      "Dave",
    ]);
    const paged = await (await queue(`from=${DAY}&to=${DAY}&pageSize=2&page=3`)).json();
    expect(paged).toMatchObject({ total: 5, page: 3 });
    expect(paged.data).toHaveLength(1);
  });

  it("lets an admin in and refuses observers, educators and students", async () => {
    expect((await queue("", admin.user.id)).status).toBe(200);
    for (const who of [alice, educator, student]) {
      const res = await queue("", who.user.id);
      expect(res.status).toBe(403);
      expect((await res.json()).error.code).toBe("forbidden");
    }
    expect((await getQueue(await apiRequest("/api/v1/review/queue"))).status).toBe(401);
  });

  it("answers 400 with the error shape for a bad query string", async () => {
    const res = await queue("status=accepted&flag=odd&colour=red");
    expect(res.status).toBe(400);
    const body = await res.json();
    expect(body.error).toMatchObject({ code: "invalid_input", message: "The query string needs attention." });
    expect(body.error.issues.length).toBeGreaterThan(0);
  });
});

describe("POST /api/v1/review/decisions", () => {
  it("queries a count with a note: audit row, notification and e-mail to the observer", async () => {
    const mailBefore = (await listCapturedMail({ limit: 500 })).length;
    const note = "170 spots in 3 groups looks like a slipped digit. Was it 17?";
    const res = await decide({ action: "query", observationIds: [ids.typo], note });
    expect(res.status).toBe(200);
    expect(await res.json()).toMatchObject({
      action: "query",
      status: "queried",
      decided: 1,
      mail: { sent: 1, failed: 0 },
    });
    expect(await statusOf([ids.typo!])).toEqual({ [ids.typo!]: "queried" });

    const [decision] = await decisionsOf(ids.typo!);
    expect(decision).toMatchObject({
      actorUserId: coordinator.user.id,
      action: "queried",
      fromStatus: "submitted",
      toStatus: "queried",
      note,
    });

    const inbox = await listUnreadNotifications({ userId: alice.user.id, limit: 10 });
    expect(inbox.total).toBe(1);
    expect(inbox.rows[0]).toMatchObject({ kind: "observation-queried", link: `/logbook/${ids.typo}` });
    expect(inbox.rows[0]?.message).toContain(note);

    const mail = await listCapturedMail({ limit: 500 });
    expect(mail.length).toBe(mailBefore + 1);
    const [latest] = mail;
    expect(latest?.toAddress).toBe(alice.user.email);
    expect(latest?.subject).toBe(`A question about your count of ${DAY}`);
    expect(latest?.textBody).toContain(note);
    expect(latest?.textBody).toContain(`http://localhost:3999/logbook/${ids.typo}`);
    expect(latest?.htmlBody).toContain(`href="http://localhost:3999/logbook/${ids.typo}"`);

    // A query changes nothing in the series.
    expect(refreshSpy).not.toHaveBeenCalled();
    // It now waits in the Queried tab, not among the submitted counts.
    const queried = await (await queue("status=queried")).json();
    expect(queried.data.map((r: { id: string }) => r.id)).toEqual([ids.typo]);
    expect(queried.counts.queried).toBe(1);
  });

  it("marks the observer's message read when they open the count", async () => {
    await markNotificationsReadByLink({ userId: alice.user.id, link: `/logbook/${ids.typo}` });
    expect((await listUnreadNotifications({ userId: alice.user.id, limit: 10 })).total).toBe(0);
  });

  it("returns an answered query to the queue with a 'resubmitted' line and fresh flags", async () => {
    const res = await putObservation(
      await apiRequest(`/api/v1/observations/${ids.typo}`, {
        method: "PUT",
        userId: alice.user.id,
        body: {
          observedAt: `${DAY}T11:00:00Z`,
          seeing: 2,
          instrumentId: alice.instrument!.id,
          groups: 3,
          spots: 17,
          notes: "Yes: 17.",
        },
      }),
      { params: Promise.resolve({ id: ids.typo! }) },
    );
    expect(res.status).toBe(200);
    expect((await res.json()).status).toBe("submitted");
    const trail = await decisionsOf(ids.typo!);
    expect(trail.map((d) => d.action)).toEqual(["queried", "resubmitted"]);
    expect(trail[1]).toMatchObject({
      actorUserId: alice.user.id,
      fromStatus: "queried",
      toStatus: "submitted",
    });
    expect(trail[1]?.note).toContain("s 170 → 17");
    // 47 sits with the network now; it is still Alice's second count that day.
    expect((await flagsOf(ids.typo!)).map((f) => f.reason)).toEqual(["second-of-the-day"]);
    const back = await (await queue(`from=${DAY}&to=${DAY}`)).json();
    expect(back.data.map((r: { id: string }) => r.id)).toContain(ids.typo);
    // Another observer cannot send it back for her.
    const stranger = await putObservation(
      await apiRequest(`/api/v1/observations/${ids.typo}`, {
        method: "PUT",
        userId: bob.user.id,
        body: {
          observedAt: `${DAY}T11:00:00Z`,
          seeing: 2,
          instrumentId: bob.instrument!.id,
          groups: 1,
          spots: 1,
        },
      }),
      { params: Promise.resolve({ id: ids.typo! }) },
    );
    expect(stranger.status).toBe(404);
    expect(await decisionsOf(ids.typo!)).toHaveLength(2);
  });

  it("rejects with a note, tells the observer, and refreshes the day", async () => {
    const res = await decide({
      action: "reject",
      observationIds: [ids.alice],
      note: "Duplicate of your 11:00 count.",
    });
    expect(res.status).toBe(200);
    expect(await statusOf([ids.alice!])).toEqual({ [ids.alice!]: "rejected" });
    const [decision] = await decisionsOf(ids.alice!);
    expect(decision).toMatchObject({
      action: "rejected",
      fromStatus: "submitted",
      toStatus: "rejected",
      note: "Duplicate of your 11:00 count.",
    });
    const inbox = await listUnreadNotifications({ userId: alice.user.id, limit: 10 });
    expect(inbox.rows[0]).toMatchObject({ kind: "observation-rejected", link: `/logbook/${ids.alice}` });
    const [latest] = await listCapturedMail({ limit: 1 });
    expect(latest?.subject).toBe(`Your count of ${DAY} is not used in the series`);
    expect(refreshSpy).toHaveBeenCalledWith({ days: [DAY] });
  });

  it("accepts in bulk: every count, one audit row each, one series refresh", async () => {
    const chosen = [ids.bob!, ids.carol!, ids.dave!];
    const notesBefore = await countRows(notifications);
    const res = await decide({ action: "accept", observationIds: chosen });
    expect(res.status).toBe(200);
    expect((await res.json()).decided).toBe(3);
    expect(Object.values(await statusOf(chosen))).toEqual(["accepted", "accepted", "accepted"]);
    for (const id of chosen) {
      const trail = await decisionsOf(id);
      expect(trail).toHaveLength(1);
      expect(trail[0]).toMatchObject({
        action: "accepted",
        fromStatus: "submitted",
        toStatus: "accepted",
        note: null,
        actorUserId: coordinator.user.id,
      });
    }
    expect(refreshSpy).toHaveBeenCalledTimes(1);
    expect(refreshSpy).toHaveBeenCalledWith({ days: [DAY] });
    // Accepting tells nobody: no message, no e-mail.
    expect(await countRows(notifications)).toBe(notesBefore);
  });

  it("lets an admin reopen an accepted count with a reason, keeping the earlier audit rows untouched", async () => {
    const before = await decisionsOf(ids.bob!);
    const res = await decide(
      { action: "reopen", observationIds: [ids.bob], note: "Seeing was 5 that morning; look again." },
      admin.user.id,
    );
    expect(res.status).toBe(200);
    expect(await statusOf([ids.bob!])).toEqual({ [ids.bob!]: "submitted" });
    const after = await decisionsOf(ids.bob!);
    expect(after.slice(0, before.length)).toEqual(before);
    expect(after.at(-1)).toMatchObject({
      action: "reopened",
      fromStatus: "accepted",
      toStatus: "submitted",
      actorUserId: admin.user.id,
    });
    expect(refreshSpy).toHaveBeenCalledWith({ days: [DAY] });
  });

  it("keeps a committed decision when the series cannot be refreshed, and says so", async () => {
    const fresh = await logCount(dave, { observedAt: `${DAY}T16:00:00Z`, groups: 5, spots: 25 });
    refreshSpy.mockRejectedValueOnce(new Error("series store unavailable"));
    const quiet = vi.spyOn(console, "error").mockImplementation(() => {});
    const res = await decide({ action: "accept", observationIds: [fresh.id] });
    quiet.mockRestore();
    expect(res.status).toBe(200);
    expect(await res.json()).toMatchObject({ decided: 1, seriesRefreshed: false });
    expect(await statusOf([fresh.id])).toEqual({ [fresh.id]: "accepted" });
  });

  it("changes nothing in a bulk accept when one id is unknown (404)", async () => {
    const fresh = await logCount(carol, { observedAt: `${DAY}T15:00:00Z`, groups: 3, spots: 15 });
    const decisionsBefore = await countRows(reviewDecisions);
    const res = await decide({
      action: "accept",
      observationIds: [ids.bob, fresh.id, "no-such-observation"],
    });
    expect(res.status).toBe(404);
    const body = await res.json();
    expect(body.error.code).toBe("not_found");
    expect(body.error.message).toContain("nothing was changed");
    expect(body.error.issues).toEqual([
      { path: "observationIds", message: "No observation with id no-such-observation." },
    ]);
    expect(await statusOf([ids.bob!, fresh.id])).toEqual({
      [ids.bob!]: "submitted",
      [fresh.id]: "submitted",
    });
    expect(await countRows(reviewDecisions)).toBe(decisionsBefore);
    expect(refreshSpy).not.toHaveBeenCalled();
  });

  it("changes nothing when one count is not in a state the decision applies to (409)", async () => {
    const decisionsBefore = await countRows(reviewDecisions);
    const res = await decide({ action: "accept", observationIds: [ids.bob, ids.carol] });
    expect(res.status).toBe(409);
    const body = await res.json();
    expect(body.error.code).toBe("conflict");
    expect(body.error.issues).toEqual([{ path: "observationIds", message: `${ids.carol} is accepted.` }]);
    expect(await statusOf([ids.bob!])).toEqual({ [ids.bob!]: "submitted" });
    expect(await countRows(reviewDecisions)).toBe(decisionsBefore);
  });

  const badBodies: Array<[string, () => unknown, string]> = [
    ["a rejection without a note", () => ({ action: "reject", observationIds: [ids.bob] }), "note"],
    [
      "a query with a blank note",
      () => ({ action: "query", observationIds: [ids.bob], note: "   " }),
      "note",
    ],
    ["an unknown action", () => ({ action: "approve", observationIds: [ids.bob] }), "action"],
    ["no observations", () => ({ action: "accept", observationIds: [] }), "observationIds"],
    ["an unknown field", () => ({ action: "accept", observationIds: [ids.bob], status: "accepted" }), ""],
    [
      "a note that is too long",
      () => ({ action: "reject", observationIds: [ids.bob], note: "x".repeat(2001) }),
      "note",
    ],
  ];

  it.each(badBodies)("answers 400 for %s and stores nothing", async (_label, makeBody, path) => {
    const [decisionsBefore, notesBefore] = [await countRows(reviewDecisions), await countRows(notifications)];
    const res = await decide(makeBody());
    expect(res.status).toBe(400);
    const body = await res.json();
    expect(body.error.code).toBe("invalid_input");
    expect(body.error.issues.map((i: { path: string }) => i.path)).toContain(path);
    expect(await statusOf([ids.bob!])).toEqual({ [ids.bob!]: "submitted" });
    expect(await countRows(reviewDecisions)).toBe(decisionsBefore);
    expect(await countRows(notifications)).toBe(notesBefore);
  });

  it("answers 400 for a body that is not JSON", async () => {
    const res = await decide("action=accept");
    expect(res.status).toBe(400);
    expect((await res.json()).error.code).toBe("invalid_json");
  });

  it("refuses observers, educators and students (403) and the signed-out (401), storing nothing", async () => {
    const decisionsBefore = await countRows(reviewDecisions);
    for (const who of [alice, educator, student]) {
      const res = await decide({ action: "accept", observationIds: [ids.bob] }, who.user.id);
      expect(res.status).toBe(403);
      expect((await res.json()).error.code).toBe("forbidden");
    }
    const signedOut = await postDecision(
      await apiRequest("/api/v1/review/decisions", {
        method: "POST",
        body: { action: "accept", observationIds: [ids.bob] },
      }),
    );
    expect(signedOut.status).toBe(401);
    expect(await statusOf([ids.bob!])).toEqual({ [ids.bob!]: "submitted" });
    expect(await countRows(reviewDecisions)).toBe(decisionsBefore);
  });

  it("takes an accepted count out of the series when its observer corrects it", async () => {
    // Dave's count was accepted in the bulk accept above; he now corrects it.
    const res = await putObservation(
      await apiRequest(`/api/v1/observations/${ids.dave}`, {
        method: "PUT",
        userId: dave.user.id,
        body: {
          observedAt: "2026-03-15T09:30:00Z",
          seeing: 2,
          instrumentId: dave.instrument!.id,
          groups: 5,
          spots: 26,
        },
      }),
      { params: Promise.resolve({ id: ids.dave! }) },
    );
    expect(res.status).toBe(200);
    expect((await decisionsOf(ids.dave!)).at(-1)).toMatchObject({
      action: "resubmitted",
      fromStatus: "accepted",
      toStatus: "submitted",
    });
    // Both the day it left and the day it moved to.
    expect(refreshSpy).toHaveBeenCalledWith({ days: [DAY, "2026-03-15"] });
  });
});

describe("GET /api/v1/review/decisions (the Decision log)", () => {
  type Entry = {
    id: string;
    decidedAt: string;
    action: string;
    fromStatus: string;
    toStatus: string;
    note: string | null;
    actorName: string | null;
    actorRole: string;
    observationId: string;
    utDate: string;
    currentStatus: string;
    observerName: string;
  };
  type LogPage = { data: Entry[]; total: number; page: number; pageSize: number };

  async function log(query: string, userId = coordinator.user.id) {
    return getDecisionLog(await apiRequest(`/api/v1/review/decisions?${query}`, { userId }));
  }
  async function logPage(query: string): Promise<LogPage> {
    const res = await log(query);
    expect(res.status).toBe(200);
    return (await res.json()) as LogPage;
  }

  it("lists every line of the audit trail, newest first, with who, what, why and on which count", async () => {
    const all = await logPage("pageSize=100");
    expect(all.total).toBe(await countRows(reviewDecisions));
    expect(all.data).toHaveLength(all.total);
    const times = all.data.map((e) => Date.parse(e.decidedAt));
    expect(times).toEqual([...times].sort((a, b) => b - a));

    // The query sent to Alice about her slipped digit above, as the coordinator wrote it.
    expect(all.data.find((e) => e.observationId === ids.typo && e.action === "queried")).toMatchObject({
      fromStatus: "submitted",
      toStatus: "queried",
      note: "170 spots in 3 groups looks like a slipped digit. Was it 17?",
      actorName: "Coordinator Quill",
      actorRole: "coordinator",
      utDate: DAY,
      observerName: "Alice",
    });
    // Dave's own correction is a line too, by the observer; his count waits again.
    expect(all.data.find((e) => e.observationId === ids.dave && e.action === "resubmitted")).toMatchObject({
      actorRole: "observer",
      currentStatus: "submitted",
    });

    const oldestFirst = await logPage("pageSize=100&sort=decidedAt:asc");
    expect(oldestFirst.data.map((e) => e.id)).toEqual(all.data.map((e) => e.id).reverse());
    const second = await logPage("pageSize=2&page=2");
    expect(second.data.map((e) => e.id)).toEqual(all.data.slice(2, 4).map((e) => e.id));
  });

  it("filters by decision, observer, who decided and the UT day of the decision", async () => {
    const everything = (await logPage("pageSize=100")).data;
    const expectFiltered = async (query: string, keep: (e: Entry) => boolean) => {
      const page = await logPage(`pageSize=100&${query}`);
      const expected = everything.filter(keep);
      expect(expected.length).toBeGreaterThan(0);
      expect(page.total).toBe(expected.length);
      expect(page.data.map((e) => e.id)).toEqual(expected.map((e) => e.id));
    };
    await expectFiltered("action=rejected", (e) => e.action === "rejected");
    await expectFiltered(`observerId=${alice.observer!.id}`, (e) => e.observerName === "Alice");
    await expectFiltered(`actorUserId=${admin.user.id}`, (e) => e.action === "reopened");
    await expectFiltered(
      `actorUserId=${coordinator.user.id}&action=accepted`,
      (e) => e.actorName === "Coordinator Quill" && e.action === "accepted",
    );

    const today = new Date().toISOString().slice(0, 10);
    const tomorrow = new Date(Date.now() + 86_400_000).toISOString().slice(0, 10);
    const yesterday = new Date(Date.now() - 86_400_000).toISOString().slice(0, 10);
    expect((await logPage(`from=${yesterday}&to=${tomorrow}`)).total).toBe(everything.length);
    expect((await logPage(`from=${tomorrow}`)).total).toBe(0);
    expect((await logPage(`to=${yesterday}`)).total).toBe(0);
    // A decision taken today is inside a range that ends today.
    expect((await logPage(`from=${today}&to=${today}`)).total).toBe(everything.length);
  });

  it("pages through every filter and order: each page is its slice of the whole list", async () => {
    for (const filter of ["", "action=accepted", `observerId=${alice.observer!.id}`]) {
      for (const sort of ["decidedAt:desc", "decidedAt:asc"]) {
        const whole = await logPage(`pageSize=100&sort=${sort}&${filter}`);
        expect(whole.total).toBeGreaterThan(1);
        for (const pageSize of [2, 3]) {
          const walked: string[] = [];
          for (let page = 1; (page - 1) * pageSize < whole.total; page++) {
            const one = await logPage(`pageSize=${pageSize}&page=${page}&sort=${sort}&${filter}`);
            expect(one.total).toBe(whole.total);
            walked.push(...one.data.map((e) => e.id));
          }
          expect(walked, `${filter || "no filter"}, ${sort}, ${pageSize} a page`).toEqual(
            whole.data.map((e) => e.id),
          );
        }
      }
    }
  });

  it("downloads every matching line as CSV, in the log's order, across batches", async () => {
    const everything = (await logPage("pageSize=100")).data;
    const res = await log("format=csv&pageSize=2");
    expect(res.status).toBe(200);
    expect(res.headers.get("content-type")).toContain("text/csv");
    expect(res.headers.get("content-disposition")).toMatch(/attachment; filename="heliotally-decision-log-/);
    const lines = (await res.text()).trimEnd().split("\r\n");
    expect(lines[0]).toBe(
      "decided_at_ut,decision,from_status,to_status,decided_by,decided_by_role,count_ut_date,observer_code,observer_name,why,status_now,observation_id",
    );
    // pageSize does not cut the download short.
    expect(lines).toHaveLength(everything.length + 1);
    expect(lines.slice(1).map((l) => l.split(",").at(-1))).toEqual(everything.map((e) => e.observationId));
    expect(lines.find((l) => l.includes("Was it 17?"))).toContain(
      ",Coordinator Quill,coordinator,2026-03-14,",
    );

    // The batches join without losing or repeating a line, oldest first too.
    const { iterateDecisionLog } = await import("@/db/queries/review");
    const ids: string[] = [];
    for await (const batch of iterateDecisionLog({ sort: "decidedAt:asc" }, 3))
      ids.push(...batch.map((d) => d.id));
    expect(ids).toEqual(everything.map((e) => e.id).reverse());
    const rejected: string[] = [];
    for await (const batch of iterateDecisionLog({ sort: "decidedAt:desc", action: "rejected" }, 1))
      rejected.push(...batch.map((d) => d.id));
    expect(rejected).toEqual(everything.filter((e) => e.action === "rejected").map((e) => e.id));
  });

  it("keeps a note from being read as a spreadsheet formula", async () => {
    const id = (await logCount(carol, { observedAt: "2026-03-22T09:30:00Z", groups: 1, spots: 3 })).id;
    expect(
      (await decide({ action: "reject", observationIds: [id], note: "=HYPERLINK(1) is not a reason" }))
        .status,
    ).toBe(200);
    const csv = await (await log("format=csv&action=rejected")).text();
    expect(csv).toContain("'=HYPERLINK(1) is not a reason");
  });

  it("lets an admin in and refuses observers, educators, students and the signed-out", async () => {
    expect((await log("", admin.user.id)).status).toBe(200);
    for (const who of [alice, educator, student]) {
      const res = await log("", who.user.id);
      expect(res.status).toBe(403);
      expect((await res.json()).error.code).toBe("forbidden");
    }
    expect((await getDecisionLog(await apiRequest("/api/v1/review/decisions"))).status).toBe(401);
  });

  it("answers 400 for a bad query string, saying what is wrong", async () => {
    for (const [query, says] of [
      ["action=approved", "action is one of"],
      ["from=2026-03-15&to=2026-03-14", "'to' must not be before 'from'."],
      ["sort=observer:asc", "sort is one of"],
      ["colour=red", "Unknown query parameter: colour."],
      ["pageSize=500", "pageSize can be at most 100."],
    ] as const) {
      const res = await log(query);
      expect(res.status).toBe(400);
      const body = await res.json();
      expect(body.error.code).toBe("invalid_input");
      expect(JSON.stringify(body.error.issues)).toContain(says);
    }
  });
});

describe("findNextAwaitingReview (the review page's 'Next waiting count')", () => {
  it("walks the waiting counts newest arrival first, wraps round, and skips the count itself", async () => {
    // Three more arrivals within the same millisecond or not: ties go by id.
    for (const spots of [11, 12, 13]) await logCount(carol, { groups: 1, spots });
    const all = await getDb()
      .select({ id: observations.id, status: observations.status, createdAt: observations.createdAt })
      .from(observations);
    const byDeskOrder = [...all].sort(
      (a, b) => b.createdAt.getTime() - a.createdAt.getTime() || (a.id < b.id ? 1 : a.id > b.id ? -1 : 0),
    );
    const waiting = byDeskOrder.filter((o) => o.status === "submitted");
    expect(waiting.length).toBeGreaterThanOrEqual(3);
    for (const [i, o] of waiting.entries()) {
      const expected = waiting[(i + 1) % waiting.length]!.id;
      expect(await findNextAwaitingReview({ observationId: o.id, receivedAt: o.createdAt })).toBe(expected);
    }
    // From a decided count, the next waiting one that arrived before it (or the newest).
    for (const decided of byDeskOrder.filter((o) => o.status !== "submitted")) {
      const position = byDeskOrder.indexOf(decided);
      const expected = byDeskOrder.slice(position + 1).find((o) => o.status === "submitted") ?? waiting[0];
      expect(await findNextAwaitingReview({ observationId: decided.id, receivedAt: decided.createdAt })).toBe(
        expected!.id,
      );
    }
  });

  it("answers null when nothing else waits", async () => {
    const waiting = await getDb()
      .select({ id: observations.id })
      .from(observations)
      .where(eq(observations.status, "submitted"));
    const [keep, ...rest] = waiting.map((w) => w.id);
    for (let i = 0; i < rest.length; i += 200) {
      expect((await decide({ action: "accept", observationIds: rest.slice(i, i + 200) })).status).toBe(200);
    }
    const [only] = await getDb()
      .select({ id: observations.id, createdAt: observations.createdAt })
      .from(observations)
      .where(eq(observations.id, keep!));
    expect(await findNextAwaitingReview({ observationId: only!.id, receivedAt: only!.createdAt })).toBeNull();
  });
});

describe("the queue's 'Question sent'", () => {
  it("shows the latest question on a queried count, and none on a count never queried", async () => {
    const asked = (await logCount(bob, { observedAt: "2026-03-20T09:30:00Z", groups: 2, spots: 9 })).id;
    const untouched = (await logCount(carol, { observedAt: "2026-03-20T10:30:00Z", groups: 2, spots: 8 })).id;
    const note = "Was the 20 March count made through cloud?";
    expect((await decide({ action: "query", observationIds: [asked], note })).status).toBe(200);

    const queried = await (await queue("status=queried&from=2026-03-20&to=2026-03-20")).json();
    const row = queried.data.find((r: { id: string }) => r.id === asked);
    expect(row.lastQuery.note).toBe(note);
    expect(Date.now() - Date.parse(row.lastQuery.askedAt)).toBeLessThan(60_000);

    const waiting = await (await queue("status=submitted&from=2026-03-20&to=2026-03-20")).json();
    expect(waiting.data.find((r: { id: string }) => r.id === untouched).lastQuery).toBeNull();

    // Bob corrects it, it is queried again: the newer question is the one shown.
    const corrected = await putObservation(
      await apiRequest(`/api/v1/observations/${asked}`, {
        method: "PUT",
        userId: bob.user.id,
        body: {
          observedAt: "2026-03-20T09:30:00Z",
          seeing: 2,
          instrumentId: bob.instrument!.id,
          groups: 2,
          spots: 10,
        },
      }),
      { params: Promise.resolve({ id: asked }) },
    );
    expect(corrected.status).toBe(200);
    const again = "Thanks. And the second group: one spot or two?";
    expect((await decide({ action: "query", observationIds: [asked], note: again })).status).toBe(200);
    const requeried = await (await queue("status=queried&from=2026-03-20&to=2026-03-20")).json();
    expect(requeried.data.find((r: { id: string }) => r.id === asked).lastQuery.note).toBe(again);
  });
});
