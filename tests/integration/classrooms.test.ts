import { and, count, eq } from "drizzle-orm";
import { beforeAll, describe, expect, it, vi } from "vitest";

import { joinClassroomAction } from "@/app/(auth)/join/actions";
import { createClassroomAction } from "@/app/(classroom)/classrooms/(list)/actions";
import {
  archiveClassroomAction,
  enrolStudentsAction,
  moveStudentAction,
  removeStudentAction,
  resetPinAction,
  scheduleSessionAction,
  updateSettingsAction,
} from "@/app/(classroom)/classrooms/[id]/actions";
import { POST as postSessionCount } from "@/app/api/v1/classroom-sessions/[id]/observations/route";
import { GET as exportTerm } from "@/app/api/v1/classrooms/[id]/term/route";
import {
  DELETE as deleteObservation,
  GET as getObservation,
  PUT as putObservation,
} from "@/app/api/v1/observations/[id]/route";
import { PUT as putTracing } from "@/app/api/v1/observations/[id]/tracing/route";
import { getDb } from "@/db/client";
import { insertSession } from "@/db/queries/classrooms";
import {
  classroomMembers,
  classrooms,
  classroomSessions,
  instruments,
  observations,
  observers,
  seriesDaily,
  users,
} from "@/db/schema";
import { getAuthOptions } from "@/lib/auth/options";
import { requireRole } from "@/lib/auth/session";
import { THROTTLE_RULES } from "@/lib/auth/throttle";
import { createClassroom, enrolStudents, removeStudent } from "@/lib/classrooms/manage";
import { ALREADY_LOGGED } from "@/lib/classrooms/session-count";
import {
  authoriseClassroomSignIn,
  CLASSROOM_ARCHIVED,
  ClassroomSignInError,
  WRONG_CODE,
  WRONG_NAME_OR_PIN,
} from "@/lib/classrooms/students";
import {
  loadClassComparison,
  loadSessionComparison,
  loadStudentClass,
  loadTermComparison,
} from "@/lib/classrooms/views";
import { createEmptyTracing } from "@/lib/validation/tracing";

import { apiRequest, makeUser, sessionCookie } from "./support";

// Server actions read the caller from the request's cookies (next/headers);
// outside Next there is no request, so the test supplies the cookie itself.
const context = vi.hoisted(() => ({ cookie: "" }));
vi.mock("next/headers", () => ({
  cookies: async () => ({ toString: () => context.cookie }),
  headers: async () => new Headers({ "x-forwarded-for": "203.0.113.9" }),
}));
vi.mock("next/cache", () => ({ revalidatePath: vi.fn() }));

async function actAs(userId: string | null) {
  context.cookie = userId ? await sessionCookie(userId) : "";
}

function form(values: Record<string, string | undefined>) {
  const data = new FormData();
  for (const [k, v] of Object.entries(values)) if (v !== undefined) data.set(k, v);
  return data;
}

const db = () => getDb();
const HOUR = 3_600_000;
const term = { termStart: "2026-01-05", termEnd: "2026-12-18" };

async function countRows(
  table: typeof users | typeof observations | typeof classroomSessions | typeof classroomMembers,
) {
  const [row] = await db().select({ n: count() }).from(table);
  return row?.n ?? 0;
}

async function membersOf(classroomId: string) {
  const [row] = await db()
    .select({ n: count() })
    .from(classroomMembers)
    .where(eq(classroomMembers.classroomId, classroomId));
  return row?.n ?? 0;
}

async function observerOf(userId: string) {
  const [row] = await db().select().from(observers).where(eq(observers.userId, userId));
  return row!;
}

/** A session whose window is set directly (the schedule form only allows same-day UT windows). */
async function makeSession(
  classroomId: string,
  { opensAt, closesAt }: { opensAt: Date; closesAt: Date },
  title = "Test session",
) {
  return insertSession({
    classroomId,
    title,
    day: opensAt.toISOString().slice(0, 10),
    opensAt,
    closesAt,
    instrumentName: "Window mirror",
    instrumentKind: "mirror",
  });
}

const count_ = (overrides: Record<string, unknown> = {}) => ({
  observedAt: new Date().toISOString(),
  seeing: 2,
  instrumentId: "ignored-for-sessions",
  groups: 3,
  spots: 17,
  ...overrides,
});

async function postCount(
  sessionId: string,
  userId: string | undefined,
  body: unknown,
  headers: Record<string, string> = {},
) {
  return postSessionCount(
    await apiRequest(`/api/v1/classroom-sessions/${sessionId}/observations`, {
      method: "POST",
      userId,
      body,
      headers,
    }),
    { params: Promise.resolve({ id: sessionId }) },
  );
}

/** The three ways a student can change a count they logged: correct it, trace it, delete it. */
const changeCount = {
  async put(observationId: string, userId: string, body: unknown) {
    return putObservation(
      await apiRequest(`/api/v1/observations/${observationId}`, { method: "PUT", userId, body }),
      { params: Promise.resolve({ id: observationId }) },
    );
  },
  async trace(observationId: string, userId: string, baseRevision: number) {
    // An empty disk (no spots) is a complete tracing: it sets the count to 0 groups, 0 spots.
    const document = {
      ...createEmptyTracing(),
      disk: { cx: 500, cy: 500, r: 400, method: "drag" as const, limbPoints: [] },
      orientation: {
        mode: "drift" as const,
        from: { x: 100, y: 950 },
        to: { x: 700, y: 950 },
        mirrored: false,
      },
    };
    return putTracing(
      await apiRequest(`/api/v1/observations/${observationId}/tracing`, {
        method: "PUT",
        userId,
        body: { document, baseRevision },
      }),
      { params: Promise.resolve({ id: observationId }) },
    );
  },
  async remove(observationId: string, userId: string) {
    return deleteObservation(
      await apiRequest(`/api/v1/observations/${observationId}`, { method: "DELETE", userId }),
      { params: Promise.resolve({ id: observationId }) },
    );
  },
};

type Made = Awaited<ReturnType<typeof makeUser>>;
let educatorA: Made;
let educatorB: Made;
let observer: Made;
let roomA: typeof classrooms.$inferSelect;
let roomA2: typeof classrooms.$inferSelect;
let roomB: typeof classrooms.$inferSelect;
let ava: { userId: string; pin: string };
let ben: { userId: string; pin: string };
let zed: { userId: string; pin: string };
let openA: Awaited<ReturnType<typeof insertSession>>;
let openB: Awaited<ReturnType<typeof insertSession>>;

beforeAll(async () => {
  educatorA = await makeUser({ role: "educator", name: "Educator A" });
  educatorB = await makeUser({ role: "educator", name: "Educator B" });
  observer = await makeUser({ role: "observer", name: "Grown-up observer" });
  roomA = await createClassroom({
    educatorUserId: educatorA.user.id,
    input: { name: "Class A", school: "School A", capacity: 4, ...term },
  });
  roomA2 = await createClassroom({
    educatorUserId: educatorA.user.id,
    input: { name: "Class A2", school: "School A", capacity: 2, ...term },
  });
  roomB = await createClassroom({
    educatorUserId: educatorB.user.id,
    input: { name: "Class B", school: "School B", capacity: 30, ...term },
  });
  const issuedA = await enrolStudents({
    educatorUserId: educatorA.user.id,
    input: { classroomId: roomA.id, displayNames: ["Ava P.", "Ben K."] },
  });
  const issuedB = await enrolStudents({
    educatorUserId: educatorB.user.id,
    input: { classroomId: roomB.id, displayNames: ["Zed Q."] },
  });
  ava = issuedA[0]!;
  ben = issuedA[1]!;
  zed = issuedB[0]!;
  const now = Date.now();
  openA = await makeSession(
    roomA.id,
    { opensAt: new Date(now - HOUR), closesAt: new Date(now + HOUR) },
    "Open A",
  );
  openB = await makeSession(
    roomB.id,
    { opensAt: new Date(now - HOUR), closesAt: new Date(now + HOUR) },
    "Open B",
  );
});

describe("educator: classrooms", () => {
  it("creates a classroom with a fresh code, and refuses a term that ends before it starts", async () => {
    await actAs(educatorA.user.id);
    const ok = await createClassroomAction(
      { ok: false },
      form({
        name: "Year 9",
        school: "School A",
        termStart: "2026-09-01",
        termEnd: "2026-12-18",
        capacity: "25",
      }),
    );
    expect(ok.ok).toBe(true);
    const [row] = await db().select().from(classrooms).where(eq(classrooms.id, ok.classroomId!));
    expect(row).toMatchObject({ educatorUserId: educatorA.user.id, capacity: 25, joinOpen: false });
    expect(row?.joinCode).toMatch(/^SUN-[34679ACDEFGHJKMNPQRTWXY]{4}$/);

    const before = await db().select({ n: count() }).from(classrooms);
    const bad = await createClassroomAction(
      { ok: false },
      form({
        name: "Year 9",
        school: "School A",
        termStart: "2026-12-18",
        termEnd: "2026-09-01",
        capacity: "25",
      }),
    );
    expect(bad).toMatchObject({ ok: false, fieldErrors: { termEnd: "The term ends before it starts." } });
    expect(await db().select({ n: count() }).from(classrooms)).toEqual(before);
  });

  it("enrols students without e-mail: a student user, an observer with no country, a class instrument, a hashed PIN", async () => {
    const [user] = await db().select().from(users).where(eq(users.id, ava.userId));
    expect(user).toMatchObject({ role: "student", email: null, name: "Ava P.", passwordHash: null });
    const profile = await observerOf(ava.userId);
    expect(profile.country).toBeNull();
    const own = await db().select().from(instruments).where(eq(instruments.observerId, profile.id));
    expect(own).toHaveLength(1);
    const [member] = await db()
      .select()
      .from(classroomMembers)
      .where(eq(classroomMembers.userId, ava.userId));
    expect(member?.pinHash).toMatch(/^\$2[aby]\$/);
    expect(member?.pinHash).not.toContain(ava.pin);
    expect(ava.pin).toMatch(/^\d{4}$/);
  });

  it("hands the fresh PINs back from the enrol action, once", async () => {
    await actAs(educatorA.user.id);
    const state = await enrolStudentsAction(
      { ok: false },
      form({ classroomId: roomA2.id, displayNames: "Cleo R.\n\nDan S.\n" }),
    );
    expect(state.ok).toBe(true);
    expect(state.issued?.map((c) => c.displayName)).toEqual(["Cleo R.", "Dan S."]);
    expect(state.issued?.every((c) => /^\d{4}$/.test(c.pin))).toBe(true);
    await expect(
      authoriseClassroomSignIn({
        raw: { code: roomA2.joinCode, displayName: "cleo r", pin: state.issued![0]!.pin },
        address: "a1",
      }),
    ).resolves.toMatchObject({ name: "Cleo R." });
  });

  it("refuses to overfill a classroom and stores nobody", async () => {
    await actAs(educatorA.user.id);
    const users0 = await countRows(users);
    // Class A2 has room for 2 and holds 2 now.
    const state = await enrolStudentsAction(
      { ok: false },
      form({ classroomId: roomA2.id, displayNames: "Eve T." }),
    );
    expect(state.ok).toBe(false);
    expect(state.message).toContain("This classroom is full (2 students)");
    expect(await countRows(users)).toBe(users0);
  });

  it("refuses a display name already in the class, or an e-mail address as a name, and stores nobody", async () => {
    await actAs(educatorA.user.id);
    const users0 = await countRows(users);
    const clash = await enrolStudentsAction(
      { ok: false },
      form({ classroomId: roomA.id, displayNames: "Cara L.\nava p" }),
    );
    expect(clash.ok).toBe(false);
    expect(clash.message).toBe('"Ava P." is already in this classroom. Add an initial to tell them apart.');
    const email = await enrolStudentsAction(
      { ok: false },
      form({ classroomId: roomA.id, displayNames: "kid@example.test" }),
    );
    expect(email.fieldErrors?.["displayNames.0"]).toContain("not an e-mail address");
    const twice = await enrolStudentsAction(
      { ok: false },
      form({ classroomId: roomA.id, displayNames: "Cara L.\ncara l" }),
    );
    expect(twice.fieldErrors?.displayNames).toContain("listed twice");
    expect(await countRows(users)).toBe(users0);
    expect(await membersOf(roomA.id)).toBe(2);
  });

  it("resets a PIN: the new one works and the old one no longer does", async () => {
    await actAs(educatorA.user.id);
    const made = await enrolStudents({
      educatorUserId: educatorA.user.id,
      input: { classroomId: roomA.id, displayNames: ["Fay W."] },
    });
    const old = made[0]!;
    const state = await resetPinAction(
      { ok: false },
      form({ classroomId: roomA.id, studentUserId: old.userId }),
    );
    expect(state.ok).toBe(true);
    const fresh = state.issued!.pin;
    await expect(
      authoriseClassroomSignIn({
        raw: { code: roomA.joinCode, displayName: "Fay W.", pin: fresh },
        address: "a2",
      }),
    ).resolves.toMatchObject({ id: old.userId });
    if (fresh !== old.pin) {
      await expect(
        authoriseClassroomSignIn({
          raw: { code: roomA.joinCode, displayName: "Fay W.", pin: old.pin },
          address: "a2",
        }),
      ).rejects.toThrow(WRONG_NAME_OR_PIN);
    }
    // Fay leaves again so the class sizes below stay as they were.
    const removed = await removeStudentAction(
      { ok: false },
      form({ classroomId: roomA.id, studentUserId: old.userId, confirm: "remove" }),
    );
    expect(removed.ok).toBe(true);
  });

  it("moves a student to another of the educator's classrooms, refusing a full one", async () => {
    await actAs(educatorA.user.id);
    const [mover] = await enrolStudents({
      educatorUserId: educatorA.user.id,
      input: { classroomId: roomA.id, displayNames: ["Gus H."] },
    });
    const full = await moveStudentAction(
      { ok: false },
      form({ classroomId: roomA.id, studentUserId: mover!.userId, targetClassroomId: roomA2.id }),
    );
    expect(full).toMatchObject({ ok: false });
    expect(full.message).toContain("full");
    expect(await membersOf(roomA.id)).toBe(3);

    const spare = await createClassroom({
      educatorUserId: educatorA.user.id,
      input: { name: "Class A3", school: "School A", capacity: 5, ...term },
    });
    const moved = await moveStudentAction(
      { ok: false },
      form({ classroomId: roomA.id, studentUserId: mover!.userId, targetClassroomId: spare.id }),
    );
    expect(moved.ok).toBe(true);
    expect(await membersOf(roomA.id)).toBe(2);
    expect(await membersOf(spare.id)).toBe(1);
    // The PIN still works, now with the new classroom's code.
    await expect(
      authoriseClassroomSignIn({
        raw: { code: spare.joinCode, displayName: "Gus H.", pin: mover!.pin },
        address: "a3",
      }),
    ).resolves.toMatchObject({ id: mover!.userId });
  });

  it("removes a student with their account and their counts", async () => {
    await actAs(educatorA.user.id);
    const [leaver] = await enrolStudents({
      educatorUserId: educatorA.user.id,
      input: { classroomId: roomA.id, displayNames: ["Hal J."] },
    });
    const res = await postCount(openA.id, leaver!.userId, count_());
    expect(res.status).toBe(201);
    const profile = await observerOf(leaver!.userId);
    const state = await removeStudentAction(
      { ok: false },
      form({ classroomId: roomA.id, studentUserId: leaver!.userId, confirm: "remove" }),
    );
    expect(state.ok).toBe(true);
    expect(await db().select().from(users).where(eq(users.id, leaver!.userId))).toEqual([]);
    expect(await db().select().from(observations).where(eq(observations.observerId, profile.id))).toEqual([]);
  });

  it("asks for a confirmation word before removing or archiving", async () => {
    await actAs(educatorA.user.id);
    const remove = await removeStudentAction(
      { ok: false },
      form({ classroomId: roomA.id, studentUserId: ava.userId }),
    );
    expect(remove.fieldErrors?.confirm).toBe("Type remove to confirm.");
    const archive = await archiveClassroomAction(
      { ok: false },
      form({ classroomId: roomA.id, confirm: "yes" }),
    );
    expect(archive.fieldErrors?.confirm).toBe("Type archive to confirm.");
    expect(await membersOf(roomA.id)).toBe(2);
  });
});

describe("educator A versus classroom B", () => {
  it("sees classroom B nowhere: pages, session, term, CSV", async () => {
    expect(await loadTermComparison({ educatorUserId: educatorA.user.id, classroomId: roomB.id })).toBeNull();
    expect(
      await loadSessionComparison({
        sessionId: openB.id,
        viewer: { role: "educator", userId: educatorA.user.id },
      }),
    ).toBeNull();
    const res = await exportTerm(
      await apiRequest(`/api/v1/classrooms/${roomB.id}/term`, { userId: educatorA.user.id }),
      { params: Promise.resolve({ id: roomB.id }) },
    );
    expect(res.status).toBe(404);
    expect((await res.json()).error.code).toBe("not_found");
  });

  it("cannot change classroom B in any way, and nothing is stored", async () => {
    await actAs(educatorA.user.id);
    const sessions0 = await countRows(classroomSessions);
    const users0 = await countRows(users);
    const notFound = { ok: false, message: "No such classroom among yours." };
    expect(
      await updateSettingsAction(
        { ok: false },
        form({ classroomId: roomB.id, joinOpen: "on", compareWithOthers: "on", capacity: "60" }),
      ),
    ).toMatchObject(notFound);
    expect(
      await enrolStudentsAction({ ok: false }, form({ classroomId: roomB.id, displayNames: "Intruder I." })),
    ).toMatchObject(notFound);
    expect(
      await resetPinAction({ ok: false }, form({ classroomId: roomB.id, studentUserId: zed.userId })),
    ).toMatchObject(notFound);
    expect(
      await removeStudentAction(
        { ok: false },
        form({ classroomId: roomB.id, studentUserId: zed.userId, confirm: "remove" }),
      ),
    ).toMatchObject(notFound);
    expect(
      await moveStudentAction(
        { ok: false },
        form({ classroomId: roomB.id, studentUserId: zed.userId, targetClassroomId: roomA.id }),
      ),
    ).toMatchObject(notFound);
    expect(
      await archiveClassroomAction({ ok: false }, form({ classroomId: roomB.id, confirm: "archive" })),
    ).toMatchObject(notFound);
    const schedule = await scheduleSessionAction(
      { ok: false },
      form({
        classroomId: roomB.id,
        title: "Sneaky",
        day: "2026-10-07",
        opensAt: "10:00",
        closesAt: "11:00",
        instrumentName: "Box",
        instrumentKind: "pinhole",
      }),
    );
    expect(schedule).toMatchObject(notFound);

    const [b] = await db().select().from(classrooms).where(eq(classrooms.id, roomB.id));
    expect(b).toMatchObject({ joinOpen: false, compareWithOthers: false, capacity: 30, archivedAt: null });
    expect(await countRows(classroomSessions)).toBe(sessions0);
    expect(await countRows(users)).toBe(users0);
    await expect(
      authoriseClassroomSignIn({
        raw: { code: roomB.joinCode, displayName: "Zed Q.", pin: zed.pin },
        address: "b1",
      }),
    ).resolves.toMatchObject({ id: zed.userId });
  });

  it("cannot reach B's students through A's own classroom id either", async () => {
    await actAs(educatorA.user.id);
    const reset = await resetPinAction(
      { ok: false },
      form({ classroomId: roomA.id, studentUserId: zed.userId }),
    );
    expect(reset).toMatchObject({ ok: false, message: "No such student in this classroom." });
    const remove = await removeStudentAction(
      { ok: false },
      form({ classroomId: roomA.id, studentUserId: zed.userId, confirm: "remove" }),
    );
    expect(remove).toMatchObject({ ok: false, message: "No such student in this classroom." });
    expect(await membersOf(roomB.id)).toBe(1);
  });

  it("cannot move a student of its own into classroom B", async () => {
    await actAs(educatorA.user.id);
    const state = await moveStudentAction(
      { ok: false },
      form({ classroomId: roomA.id, studentUserId: ben.userId, targetClassroomId: roomB.id }),
    );
    expect(state).toMatchObject({
      ok: false,
      fieldErrors: { targetClassroomId: "Choose one of your own classrooms." },
    });
    expect(await membersOf(roomB.id)).toBe(1);
  });

  it("keeps other roles out of the educator's actions", async () => {
    await actAs(ava.userId);
    expect(
      await enrolStudentsAction({ ok: false }, form({ classroomId: roomA.id, displayNames: "Me Too" })),
    ).toMatchObject({ ok: false, message: "Your account does not have access to this." });
    await actAs(null);
    expect(await createClassroomAction({ ok: false }, form({ name: "X", school: "Y" }))).toMatchObject({
      ok: false,
      message: "Sign in to continue.",
    });
    const res = await exportTerm(
      await apiRequest(`/api/v1/classrooms/${roomA.id}/term`, { userId: observer.user.id }),
      { params: Promise.resolve({ id: roomA.id }) },
    );
    expect(res.status).toBe(403);
  });
});

describe("sessions", () => {
  it("schedules a session within the term and refuses a window that closes before it opens or a day outside the term", async () => {
    await actAs(educatorA.user.id);
    const valid = {
      classroomId: roomA.id,
      title: "Week 1",
      day: "2026-10-07",
      opensAt: "10:00",
      closesAt: "11:00",
      instrumentName: "Class mirror",
      instrumentKind: "mirror",
    };
    const ok = await scheduleSessionAction({ ok: false }, form(valid));
    expect(ok.ok).toBe(true);
    const [row] = await db().select().from(classroomSessions).where(eq(classroomSessions.id, ok.sessionId!));
    expect(row).toMatchObject({
      day: "2026-10-07",
      opensAt: new Date("2026-10-07T10:00:00Z"),
      closesAt: new Date("2026-10-07T11:00:00Z"),
      instrumentKind: "mirror",
    });

    const sessions0 = await countRows(classroomSessions);
    const backwards = await scheduleSessionAction(
      { ok: false },
      form({ ...valid, opensAt: "11:00", closesAt: "10:30" }),
    );
    expect(backwards.fieldErrors?.closesAt).toBe(
      "The session must close after it opens, on the same UT day.",
    );
    const outside = await scheduleSessionAction({ ok: false }, form({ ...valid, day: "2027-02-01" }));
    expect(outside.fieldErrors?.day).toBe("Choose a day within the term (2026-01-05 to 2026-12-18).");
    const noKind = await scheduleSessionAction(
      { ok: false },
      form({ ...valid, instrumentKind: "binoculars" }),
    );
    expect(noKind.fieldErrors?.instrumentKind).toBeDefined();
    expect(await countRows(classroomSessions)).toBe(sessions0);
  });
});

describe("students: signing in with the classroom code", () => {
  it("signs a student in with code, name and PIN, forgiving case and spacing", async () => {
    await expect(
      authoriseClassroomSignIn({
        raw: { code: ` ${roomA.joinCode.toLowerCase()} `, displayName: "AVA  P", pin: ava.pin },
        address: "s1",
      }),
    ).resolves.toEqual({ id: ava.userId, name: "Ava P." });
  });

  it('is wired into next-auth as the "classroom" credentials provider', async () => {
    // next-auth keeps a provider's own settings (its id, authorize) under `options` until it merges them.
    const provider = getAuthOptions().providers.find(
      (p) => (p as { options?: { id?: string } }).options?.id === "classroom",
    ) as unknown as {
      options: { authorize: (raw: unknown, req: unknown) => Promise<unknown> };
    };
    expect(provider).toBeDefined();
    await expect(
      provider.options.authorize(
        { code: roomA.joinCode, displayName: "Ben K.", pin: ben.pin, csrfToken: "x" },
        { headers: {} },
      ),
    ).resolves.toMatchObject({ id: ben.userId, email: null });
    await expect(
      provider.options.authorize(
        { code: "SUN-0000", displayName: "Ben K.", pin: ben.pin },
        { headers: { "x-forwarded-for": "198.51.100.77" } },
      ),
    ).rejects.toThrow(WRONG_CODE);
  });

  it("says clearly when the code is wrong, or the name and PIN do not match", async () => {
    await expect(
      authoriseClassroomSignIn({
        raw: { code: "SUN-XXXX", displayName: "Ava P.", pin: ava.pin },
        address: "s2",
      }),
    ).rejects.toThrow(WRONG_CODE);
    const wrongPin = ava.pin === "4821" ? "4822" : "4821";
    await expect(
      authoriseClassroomSignIn({
        raw: { code: roomA.joinCode, displayName: "Ava P.", pin: wrongPin },
        address: "s2",
      }),
    ).rejects.toThrow(WRONG_NAME_OR_PIN);
    await expect(
      authoriseClassroomSignIn({
        raw: { code: roomA.joinCode, displayName: "Nobody N.", pin: "4821" },
        address: "s2",
      }),
    ).rejects.toThrow(WRONG_NAME_OR_PIN);
    // Another classroom's student cannot sign in with this classroom's code.
    await expect(
      authoriseClassroomSignIn({
        raw: { code: roomA.joinCode, displayName: "Zed Q.", pin: zed.pin },
        address: "s2",
      }),
    ).rejects.toThrow(WRONG_NAME_OR_PIN);
    await expect(
      authoriseClassroomSignIn({
        raw: { code: roomA.joinCode, displayName: "Ava P.", pin: "12" },
        address: "s2",
      }),
    ).rejects.toThrow("Your PIN is the 4 digits on your sign-in card.");
  });

  it("locks one student's sign-in after repeated wrong PINs, even for the right PIN, with a clear message", async () => {
    const [target] = await enrolStudents({
      educatorUserId: educatorB.user.id,
      input: { classroomId: roomB.id, displayNames: ["Lock L."] },
    });
    const wrong = target!.pin === "4821" ? "4822" : "4821";
    const t0 = new Date();
    for (let i = 0; i < THROTTLE_RULES.account.maxFailures; i++) {
      await expect(
        authoriseClassroomSignIn({
          raw: { code: roomB.joinCode, displayName: "Lock L.", pin: wrong },
          address: "s3",
          now: t0,
        }),
      ).rejects.toThrow(WRONG_NAME_OR_PIN);
    }
    const locked = authoriseClassroomSignIn({
      raw: { code: roomB.joinCode, displayName: "Lock L.", pin: target!.pin },
      address: "s3",
      now: t0,
    });
    await expect(locked).rejects.toBeInstanceOf(ClassroomSignInError);
    await expect(locked).rejects.toThrow(
      /Too many wrong tries\. Wait 15 minutes, or ask your teacher to reset your PIN\./,
    );
    // Classmates are not locked out by one student's mistakes.
    await expect(
      authoriseClassroomSignIn({
        raw: { code: roomB.joinCode, displayName: "Zed Q.", pin: zed.pin },
        address: "s3",
        now: t0,
      }),
    ).resolves.toMatchObject({ id: zed.userId });
    // After the lock runs out the right PIN works again.
    const later = new Date(t0.getTime() + THROTTLE_RULES.account.lockMs + 1000);
    await expect(
      authoriseClassroomSignIn({
        raw: { code: roomB.joinCode, displayName: "Lock L.", pin: target!.pin },
        address: "s3",
        now: later,
      }),
    ).resolves.toMatchObject({ id: target!.userId });
  });

  it("locks a network address that keeps guessing classroom codes", async () => {
    const t0 = new Date();
    for (let i = 0; i < THROTTLE_RULES.address.maxFailures; i++) {
      await expect(
        authoriseClassroomSignIn({
          raw: { code: `SUN-G${String(i).padStart(3, "0")}`, displayName: "Ava P.", pin: "4821" },
          address: "192.0.2.200",
          now: t0,
        }),
      ).rejects.toThrow(WRONG_CODE);
    }
    await expect(
      authoriseClassroomSignIn({
        raw: { code: roomA.joinCode, displayName: "Ava P.", pin: ava.pin },
        address: "192.0.2.200",
        now: t0,
      }),
    ).rejects.toThrow(/Too many wrong tries/);
    await expect(
      authoriseClassroomSignIn({
        raw: { code: roomA.joinCode, displayName: "Ava P.", pin: ava.pin },
        address: "192.0.2.201",
        now: t0,
      }),
    ).resolves.toMatchObject({ id: ava.userId });
  });
});

describe("students: joining with the code", () => {
  it("refuses while joining is closed, then lets a student in once it is open, with a PIN shown once", async () => {
    await actAs(null);
    const users0 = await countRows(users);
    const closed = await joinClassroomAction(
      { ok: false },
      form({ code: roomB.joinCode, displayName: "New N." }),
    );
    expect(closed).toMatchObject({ ok: false });
    expect(closed.message).toContain("not open for joining");
    expect(await countRows(users)).toBe(users0);

    await db().update(classrooms).set({ joinOpen: true }).where(eq(classrooms.id, roomB.id));
    const joined = await joinClassroomAction(
      { ok: false },
      form({ code: roomB.joinCode.toLowerCase(), displayName: "New N." }),
    );
    expect(joined.ok).toBe(true);
    expect(joined.card).toMatchObject({
      code: roomB.joinCode,
      displayName: "New N.",
      classroomName: "Class B",
    });
    await expect(
      authoriseClassroomSignIn({
        raw: { code: roomB.joinCode, displayName: "New N.", pin: joined.card!.pin },
        address: "j1",
      }),
    ).resolves.toMatchObject({ name: "New N." });

    const taken = await joinClassroomAction(
      { ok: false },
      form({ code: roomB.joinCode, displayName: "new n" }),
    );
    expect(taken.fieldErrors?.displayName).toContain("already uses that name");
    await db().update(classrooms).set({ joinOpen: false }).where(eq(classrooms.id, roomB.id));
  });

  it("refuses a full classroom and an unknown code, storing nothing", async () => {
    await actAs(null);
    await db().update(classrooms).set({ joinOpen: true }).where(eq(classrooms.id, roomA2.id));
    const users0 = await countRows(users);
    const full = await joinClassroomAction(
      { ok: false },
      form({ code: roomA2.joinCode, displayName: "Late L." }),
    );
    expect(full).toMatchObject({ ok: false, message: "This classroom is full. Ask your teacher." });
    const unknown = await joinClassroomAction(
      { ok: false },
      form({ code: "SUN-ZZZZ", displayName: "Late L." }),
    );
    expect(unknown.fieldErrors?.code).toBe(WRONG_CODE);
    expect(await countRows(users)).toBe(users0);
    await db().update(classrooms).set({ joinOpen: false }).where(eq(classrooms.id, roomA2.id));
  });
});

describe("students: logging a count for a session", () => {
  it("stores the count with its session, under the session's instrument", async () => {
    const res = await postCount(openA.id, ava.userId, count_({ groups: 4, spots: 20 }));
    expect(res.status).toBe(201);
    const body = await res.json();
    const [row] = await db().select().from(observations).where(eq(observations.id, body.id));
    expect(row).toMatchObject({ classSessionId: openA.id, source: "classroom", groups: 4, spots: 20 });
    const [instrument] = await db().select().from(instruments).where(eq(instruments.id, row!.instrumentId));
    expect(instrument).toMatchObject({
      name: "Window mirror",
      kind: "mirror",
      observerId: (await observerOf(ava.userId)).id,
    });
  });

  it("refuses a second count for the same session, and stores nothing", async () => {
    const before = await countRows(observations);
    const res = await postCount(openA.id, ava.userId, count_({ groups: 1, spots: 1 }));
    expect(res.status).toBe(409);
    expect((await res.json()).error.message).toBe(ALREADY_LOGGED);
    expect(await countRows(observations)).toBe(before);
  });

  it("lets only one of two simultaneous sends in", async () => {
    const [first, second] = await Promise.all([
      postCount(openA.id, ben.userId, count_({ groups: 2, spots: 9 })),
      postCount(openA.id, ben.userId, count_({ groups: 2, spots: 9 })),
    ]);
    expect([first.status, second.status].sort()).toEqual([201, 409]);
    const profile = await observerOf(ben.userId);
    const rows = await db()
      .select()
      .from(observations)
      .where(and(eq(observations.observerId, profile.id), eq(observations.classSessionId, openA.id)));
    expect(rows).toHaveLength(1);
  });

  it("replays the first answer for a repeated Idempotency-Key", async () => {
    const [kid] = await enrolStudents({
      educatorUserId: educatorB.user.id,
      input: { classroomId: roomB.id, displayNames: ["Ida K."] },
    });
    const headers = { "idempotency-key": "class-count-0001" };
    const body = count_();
    const first = await postCount(openB.id, kid!.userId, body, headers);
    const again = await postCount(openB.id, kid!.userId, body, headers);
    expect(first.status).toBe(201);
    expect(again.status).toBe(201);
    expect(again.headers.get("idempotent-replayed")).toBe("true");
    expect((await again.json()).id).toBe((await first.json()).id);
  });

  it("refuses a count sent before the session opens or after it closes", async () => {
    const now = Date.now();
    const later = await makeSession(
      roomA.id,
      { opensAt: new Date(now + HOUR), closesAt: new Date(now + 2 * HOUR) },
      "Later",
    );
    const earlier = await makeSession(
      roomA.id,
      { opensAt: new Date(now - 3 * HOUR), closesAt: new Date(now - 2 * HOUR) },
      "Earlier",
    );
    const before = await countRows(observations);
    const tooEarly = await postCount(later.id, ava.userId, count_());
    expect(tooEarly.status).toBe(409);
    expect((await tooEarly.json()).error.message).toMatch(
      /^“Later” has not opened yet\. Counts can be logged .* UT\.$/,
    );
    const tooLate = await postCount(
      earlier.id,
      ava.userId,
      count_({ observedAt: new Date(now - 2.5 * HOUR).toISOString() }),
    );
    expect(tooLate.status).toBe(409);
    expect((await tooLate.json()).error.message).toContain("“Earlier” has closed");
    expect(await countRows(observations)).toBe(before);
  });

  it("refuses an observation time outside the session's window, beside the time field", async () => {
    const [kid] = await enrolStudents({
      educatorUserId: educatorB.user.id,
      input: { classroomId: roomB.id, displayNames: ["Jo M."] },
    });
    const before = await countRows(observations);
    const res = await postCount(
      openB.id,
      kid!.userId,
      count_({ observedAt: new Date(Date.now() - 5 * HOUR).toISOString() }),
    );
    expect(res.status).toBe(400);
    const body = await res.json();
    expect(body.error.issues[0].path).toBe("observedAt");
    expect(body.error.issues[0].message).toContain("Give the time you counted during the session");
    expect(await countRows(observations)).toBe(before);
  });

  it("refuses a count for another classroom's session as if it did not exist", async () => {
    const before = await countRows(observations);
    const res = await postCount(openB.id, ava.userId, count_());
    expect(res.status).toBe(404);
    expect((await res.json()).error.message).toBe("No such session in your classroom.");
    expect(await countRows(observations)).toBe(before);
  });

  it("accepts session counts from students only", async () => {
    expect((await postCount(openA.id, observer.user.id, count_())).status).toBe(403);
    expect((await postCount(openA.id, educatorA.user.id, count_())).status).toBe(403);
    expect((await postCount(openA.id, undefined, count_())).status).toBe(401);
  });

  it("validates the count with the observation schema", async () => {
    const res = await postCount(openA.id, ava.userId, count_({ groups: 5, spots: 3 }));
    expect(res.status).toBe(400);
    expect((await res.json()).error.issues[0].path).toBe("spots");
  });
});

describe("students: changing a session count", () => {
  let lee: { userId: string; pin: string };
  let session: Awaited<ReturnType<typeof insertSession>>;
  let countId: string;

  const storedCount = async () =>
    (await db().select().from(observations).where(eq(observations.id, countId)))[0] ?? null;

  beforeAll(async () => {
    const [issued] = await enrolStudents({
      educatorUserId: educatorB.user.id,
      input: { classroomId: roomB.id, displayNames: ["Lee C."] },
    });
    lee = issued!;
    const now = Date.now();
    session = await makeSession(
      roomB.id,
      { opensAt: new Date(now - HOUR), closesAt: new Date(now + HOUR) },
      "Changing",
    );
    const res = await postCount(session.id, lee.userId, count_({ groups: 2, spots: 8 }));
    expect(res.status).toBe(201);
    countId = (await res.json()).id;
  });

  it("lets the student correct, trace and keep the count while the session is open, under the session's rules", async () => {
    const sessionInstrumentId = (await storedCount())!.instrumentId;
    const corrected = await changeCount.put(
      countId,
      lee.userId,
      count_({ groups: 3, spots: 11, instrumentId: "some-other-instrument" }),
    );
    expect(corrected.status).toBe(200);
    // Still filed under the session's instrument, whatever the form sent.
    expect(await storedCount()).toMatchObject({ groups: 3, spots: 11, instrumentId: sessionInstrumentId });

    const outside = await changeCount.put(
      countId,
      lee.userId,
      count_({ observedAt: new Date(Date.now() - 5 * HOUR).toISOString() }),
    );
    expect(outside.status).toBe(400);
    expect((await outside.json()).error.issues[0].path).toBe("observedAt");
    expect(await storedCount()).toMatchObject({ groups: 3, spots: 11 });

    const traced = await changeCount.trace(countId, lee.userId, 0);
    expect(traced.status).toBe(200);
    expect(await storedCount()).toMatchObject({ groups: 0, spots: 0 });
  });

  it("refuses a correction, a tracing and a deletion once the session has closed, and changes nothing", async () => {
    const now = Date.now();
    await db()
      .update(classroomSessions)
      .set({ opensAt: new Date(now - 2 * HOUR), closesAt: new Date(now - 60_000) })
      .where(eq(classroomSessions.id, session.id));
    const before = await storedCount();

    const corrected = await changeCount.put(countId, lee.userId, count_({ groups: 5, spots: 30 }));
    expect(corrected.status).toBe(409);
    expect((await corrected.json()).error.message).toMatch(
      /^“Changing” closed at \d\d:\d\d UT on \d{4}-\d\d-\d\d, so its counts can no longer be changed or deleted\.$/,
    );

    const traced = await changeCount.trace(countId, lee.userId, 1);
    expect(traced.status).toBe(409);
    expect((await traced.json()).error.message).toContain("“Changing” closed at");

    const removed = await changeCount.remove(countId, lee.userId);
    expect(removed.status).toBe(409);
    expect((await removed.json()).error.message).toContain("“Changing” closed at");

    expect(await storedCount()).toEqual(before);
  });

  it("leaves the educator's view of the closed session and the student's own reading as they were", async () => {
    const read = await getObservation(
      await apiRequest(`/api/v1/observations/${countId}`, { userId: lee.userId }),
      { params: Promise.resolve({ id: countId }) },
    );
    expect(read.status).toBe(200);
    const view = await loadSessionComparison({
      sessionId: session.id,
      viewer: { role: "educator", userId: educatorB.user.id },
    });
    expect(view?.comparison?.rows.map((r) => r.displayName)).toContain("Lee C.");
  });
});

describe("students versus other students and other classrooms", () => {
  it("cannot open another student's observation", async () => {
    const [avaRow] = await db()
      .select()
      .from(observations)
      .where(
        and(
          eq(observations.observerId, (await observerOf(ava.userId)).id),
          eq(observations.classSessionId, openA.id),
        ),
      );
    const res = await getObservation(
      await apiRequest(`/api/v1/observations/${avaRow!.id}`, { userId: ben.userId }),
      { params: Promise.resolve({ id: avaRow!.id }) },
    );
    expect(res.status).toBe(404);
  });

  it("sees the class's counts, by display name, only after logging their own", async () => {
    const [kid] = await enrolStudents({
      educatorUserId: educatorA.user.id,
      input: { classroomId: roomA.id, displayNames: ["Kit N."] },
    });
    const kitObserver = await observerOf(kid!.userId);
    const before = await loadSessionComparison({
      sessionId: openA.id,
      viewer: { role: "student", userId: kid!.userId, observerId: kitObserver.id },
    });
    expect(before?.comparison).toBeNull();
    expect(before?.countsLogged).toBe(2);
    expect((await postCount(openA.id, kid!.userId, count_({ groups: 3, spots: 12 }))).status).toBe(201);
    const after = await loadSessionComparison({
      sessionId: openA.id,
      viewer: { role: "student", userId: kid!.userId, observerId: kitObserver.id },
    });
    expect(after?.comparison?.rows.map((r) => r.displayName).sort()).toEqual(["Ava P.", "Ben K.", "Kit N."]);
    // Medians of 60 (Ava), 29 (Ben), 42 (Kit): 42.
    expect(after?.comparison?.median?.raw).toBe(42);
    await removeStudent({
      educatorUserId: educatorA.user.id,
      classroomId: roomA.id,
      studentUserId: kid!.userId,
    });
  });

  it("cannot see another classroom's session or classroom", async () => {
    const avaObserver = await observerOf(ava.userId);
    expect(
      await loadSessionComparison({
        sessionId: openB.id,
        viewer: { role: "student", userId: ava.userId, observerId: avaObserver.id },
      }),
    ).toBeNull();
    const own = await loadStudentClass({ userId: ava.userId, observerId: avaObserver.id });
    expect(own?.classroom.id).toBe(roomA.id);
    expect(own?.open.map((s) => s.id)).toContain(openA.id);
    expect(own?.open.map((s) => s.id)).not.toContain(openB.id);
  });

  it("is kept out of the Review desk and the educator's pages by the role guard", async () => {
    const request = await apiRequest("/x", { userId: ava.userId });
    await expect(requireRole(["coordinator"], { request })).rejects.toMatchObject({ code: "forbidden" });
    await expect(requireRole(["educator"], { request })).rejects.toMatchObject({ code: "forbidden" });
    await expect(requireRole(["observer", "student"], { request })).resolves.toMatchObject({
      role: "student",
    });
  });
});

describe("comparisons", () => {
  it("puts the network's value for the day beside the class, where there is one", async () => {
    const day = openA.day;
    const without = await loadSessionComparison({
      sessionId: openA.id,
      viewer: { role: "educator", userId: educatorA.user.id },
    });
    expect(without?.comparison?.network).toBeNull();
    await db()
      .insert(seriesDaily)
      .values({ day, hemisphere: "all", observers: 7, sum: 7 * 90, sumSquares: 7 * 8100, mean: 90, sd: 0 });
    const withNetwork = await loadSessionComparison({
      sessionId: openA.id,
      viewer: { role: "educator", userId: educatorA.user.id },
    });
    expect(withNetwork?.network).toEqual({ mean: 90, observers: 7 });
    expect(withNetwork?.comparison?.network?.value).toBe(90);
  });

  it("exports the term table as CSV with each student's counts and k", async () => {
    const res = await exportTerm(
      await apiRequest(`/api/v1/classrooms/${roomA.id}/term?method=median-of-ratios`, {
        userId: educatorA.user.id,
      }),
      { params: Promise.resolve({ id: roomA.id }) },
    );
    expect(res.status).toBe(200);
    expect(res.headers.get("content-type")).toContain("text/csv");
    expect(res.headers.get("content-disposition")).toContain("class-a-term-2026-01-05.csv");
    const lines = (await res.text()).trim().split("\r\n");
    expect(lines[0]).toBe(
      `Student,Sessions counted,k,k uncertainty (±),Settled after (sessions),${openA.day} 10g+s`,
    );
    // Ava 60 and Ben 29 in the one session: median 44.5, so Ava's k = 44.5 / 60.
    expect(lines).toContain(`Ava P.,1,${Math.round((44.5 / 60) * 1000) / 1000},,,60`);
    expect(lines.at(-1)).toBe("Class median,,,,,44.5");
    const bad = await exportTerm(
      await apiRequest(`/api/v1/classrooms/${roomA.id}/term?method=guess`, { userId: educatorA.user.id }),
      { params: Promise.resolve({ id: roomA.id }) },
    );
    expect(bad.status).toBe(400);
  });

  it("compares opted-in classrooms without any student's name", async () => {
    expect(await loadClassComparison({ educatorUserId: educatorA.user.id })).toMatchObject({
      optedIn: false,
    });
    await actAs(educatorA.user.id);
    expect(
      (
        await updateSettingsAction(
          { ok: false },
          form({ classroomId: roomA.id, compareWithOthers: "on", capacity: "4" }),
        )
      ).ok,
    ).toBe(true);
    await db().update(classrooms).set({ compareWithOthers: true }).where(eq(classrooms.id, roomB.id));
    const view = await loadClassComparison({ educatorUserId: educatorA.user.id });
    if (!view.optedIn) throw new Error("expected the comparison");
    expect(view.classes.map((c) => c.label)).toEqual(["Class A", "Class B (School B)"]);
    expect(view.classes.find((c) => c.id === roomA.id)?.classK.k).toBeCloseTo(90 / 44.5, 12);
    const text = JSON.stringify(view);
    for (const name of ["Ava P.", "Ben K.", "Zed Q.", "Ida K.", ava.userId, zed.userId])
      expect(text).not.toContain(name);
  });

  it("keeps the students when the class size limit is lowered, and only stops new ones", async () => {
    await actAs(educatorA.user.id);
    const state = await updateSettingsAction({ ok: false }, form({ classroomId: roomA.id, capacity: "1" }));
    expect(state.ok).toBe(true);
    expect(await membersOf(roomA.id)).toBe(2);
    const more = await enrolStudentsAction(
      { ok: false },
      form({ classroomId: roomA.id, displayNames: "Extra E." }),
    );
    expect(more.message).toContain("full");
    await updateSettingsAction({ ok: false }, form({ classroomId: roomA.id, capacity: "4" }));
  });
});

describe("archiving at the end of term", () => {
  it("keeps the data readable for the educator, and closes sign-in, counts and changes", async () => {
    await actAs(educatorA.user.id);
    const state = await archiveClassroomAction(
      { ok: false },
      form({ classroomId: roomA.id, confirm: "archive" }),
    );
    expect(state.ok).toBe(true);
    expect(
      (await loadTermComparison({ educatorUserId: educatorA.user.id, classroomId: roomA.id }))?.medians,
    ).toHaveLength(1);
    await expect(
      authoriseClassroomSignIn({
        raw: { code: roomA.joinCode, displayName: "Ava P.", pin: ava.pin },
        address: "z1",
      }),
    ).rejects.toThrow(CLASSROOM_ARCHIVED);
    const res = await postCount(openA.id, ben.userId, count_());
    expect(res.status).toBe(409);
    // Ben's count in the still-open session is frozen with the classroom.
    const [bensCount] = await db()
      .select()
      .from(observations)
      .where(
        and(
          eq(observations.observerId, (await observerOf(ben.userId)).id),
          eq(observations.classSessionId, openA.id),
        ),
      );
    const correction = await changeCount.put(bensCount!.id, ben.userId, count_({ groups: 1, spots: 1 }));
    expect(correction.status).toBe(409);
    expect((await correction.json()).error.message).toContain("finished for the term");
    expect((await changeCount.remove(bensCount!.id, ben.userId)).status).toBe(409);
    const schedule = await scheduleSessionAction(
      { ok: false },
      form({
        classroomId: roomA.id,
        title: "After",
        day: "2026-10-07",
        opensAt: "10:00",
        closesAt: "11:00",
        instrumentName: "Box",
        instrumentKind: "pinhole",
      }),
    );
    expect(schedule.message).toContain("archived");
    const enrol = await enrolStudentsAction(
      { ok: false },
      form({ classroomId: roomA.id, displayNames: "Late L." }),
    );
    expect(enrol.message).toContain("archived");
  });
});
