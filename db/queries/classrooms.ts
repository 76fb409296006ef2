import "server-only";

import { and, asc, count, desc, eq, inArray, isNotNull, ne } from "drizzle-orm";

import { normaliseDisplayName } from "@/lib/classrooms/codes";
import { AppError } from "@/lib/http/errors";
import { makeObserverCode } from "@/lib/observers/observer-code";

import { getDb, type Database } from "../client";
import {
  classroomMembers,
  classrooms,
  classroomSessions,
  instruments,
  observations,
  observers,
  seriesDaily,
  users,
  type InstrumentKind,
} from "../schema";

type Tx = Parameters<Parameters<Database["transaction"]>[0]>[0];
type Executor = Database | Tx;

// ---------------------------------------------------------------------------
// Classrooms: an educator sees and changes only their own
// ---------------------------------------------------------------------------

const classroomColumns = {
  id: classrooms.id,
  educatorUserId: classrooms.educatorUserId,
  name: classrooms.name,
  school: classrooms.school,
  termStart: classrooms.termStart,
  termEnd: classrooms.termEnd,
  joinCode: classrooms.joinCode,
  joinOpen: classrooms.joinOpen,
  capacity: classrooms.capacity,
  compareWithOthers: classrooms.compareWithOthers,
  archivedAt: classrooms.archivedAt,
  createdAt: classrooms.createdAt,
};

export type ClassroomRow = typeof classrooms.$inferSelect;

/** An educator sees only their own classrooms. */
export async function listClassroomsOfEducator({ educatorUserId }: { educatorUserId: string }) {
  return getDb()
    .select({ ...classroomColumns, students: count(classroomMembers.userId) })
    .from(classrooms)
    .leftJoin(classroomMembers, eq(classroomMembers.classroomId, classrooms.id))
    .where(eq(classrooms.educatorUserId, educatorUserId))
    .groupBy(classrooms.id)
    .orderBy(classrooms.name);
}

/** The classroom when it is the educator's own, else null (the caller answers 404). */
export async function getClassroomOfEducator({
  educatorUserId,
  classroomId,
}: {
  educatorUserId: string;
  classroomId: string;
}) {
  const [row] = await getDb()
    .select()
    .from(classrooms)
    .where(and(eq(classrooms.id, classroomId), eq(classrooms.educatorUserId, educatorUserId)))
    .limit(1);
  return row ?? null;
}

export async function isJoinCodeTaken({ joinCode }: { joinCode: string }) {
  const [row] = await getDb()
    .select({ id: classrooms.id })
    .from(classrooms)
    .where(eq(classrooms.joinCode, joinCode))
    .limit(1);
  return Boolean(row);
}

export async function insertClassroom(values: typeof classrooms.$inferInsert) {
  const [row] = await getDb().insert(classrooms).values(values).returning();
  if (!row) throw new Error("insert returned nothing");
  return row;
}

/** Changes the educator's own classroom; false when it is not theirs. */
export async function updateClassroomOfEducator({
  educatorUserId,
  classroomId,
  set,
}: {
  educatorUserId: string;
  classroomId: string;
  set: Partial<Pick<ClassroomRow, "joinOpen" | "capacity" | "compareWithOthers" | "archivedAt">>;
}) {
  const rows = await getDb()
    .update(classrooms)
    .set(set)
    .where(and(eq(classrooms.id, classroomId), eq(classrooms.educatorUserId, educatorUserId)))
    .returning({ id: classrooms.id });
  return rows.length > 0;
}

export async function findClassroomByJoinCode({ joinCode }: { joinCode: string }) {
  const [row] = await getDb().select().from(classrooms).where(eq(classrooms.joinCode, joinCode)).limit(1);
  return row ?? null;
}

// ---------------------------------------------------------------------------
// Members (students)
// ---------------------------------------------------------------------------

/** The students of a classroom, with how many session counts each has logged there. */
export async function listMembersOfClassroom({ classroomId }: { classroomId: string }) {
  const db = getDb();
  const members = await db
    .select({
      userId: classroomMembers.userId,
      joinedAt: classroomMembers.joinedAt,
      observerId: observers.id,
      displayName: observers.displayName,
    })
    .from(classroomMembers)
    .innerJoin(observers, eq(observers.userId, classroomMembers.userId))
    .where(eq(classroomMembers.classroomId, classroomId))
    .orderBy(asc(observers.displayName));
  if (members.length === 0) return [];
  const counted = await db
    .select({ observerId: observations.observerId, n: count() })
    .from(observations)
    .innerJoin(classroomSessions, eq(classroomSessions.id, observations.classSessionId))
    .where(
      and(
        eq(classroomSessions.classroomId, classroomId),
        inArray(
          observations.observerId,
          members.map((m) => m.observerId),
        ),
      ),
    )
    .groupBy(observations.observerId);
  const byObserver = new Map(counted.map((c) => [c.observerId, c.n]));
  return members.map((m) => ({ ...m, sessionCounts: byObserver.get(m.observerId) ?? 0 }));
}

/** A student's membership (there is at most one) with their classroom. */
export async function getMembershipOfStudent({ userId }: { userId: string }) {
  const [row] = await getDb()
    .select({
      pinHash: classroomMembers.pinHash,
      joinedAt: classroomMembers.joinedAt,
      classroom: classroomColumns,
    })
    .from(classroomMembers)
    .innerJoin(classrooms, eq(classrooms.id, classroomMembers.classroomId))
    .where(eq(classroomMembers.userId, userId))
    .limit(1);
  return row ?? null;
}

/** The member of a classroom whose display name matches (case, dots and spaces aside). */
export async function findMemberByDisplayName({
  classroomId,
  displayName,
}: {
  classroomId: string;
  displayName: string;
}) {
  const wanted = normaliseDisplayName(displayName);
  const rows = await getDb()
    .select({
      userId: classroomMembers.userId,
      pinHash: classroomMembers.pinHash,
      displayName: observers.displayName,
      disabledAt: users.disabledAt,
    })
    .from(classroomMembers)
    .innerJoin(observers, eq(observers.userId, classroomMembers.userId))
    .innerJoin(users, eq(users.id, classroomMembers.userId))
    .where(eq(classroomMembers.classroomId, classroomId));
  return rows.find((r) => normaliseDisplayName(r.displayName) === wanted) ?? null;
}

async function assertRoomFor({
  tx,
  classroomId,
  capacity,
  displayNames,
  ignoreUserId,
}: {
  tx: Executor;
  classroomId: string;
  capacity: number;
  displayNames: string[];
  ignoreUserId?: string;
}) {
  const current = await tx
    .select({ userId: classroomMembers.userId, displayName: observers.displayName })
    .from(classroomMembers)
    .innerJoin(observers, eq(observers.userId, classroomMembers.userId))
    .where(
      and(
        eq(classroomMembers.classroomId, classroomId),
        ignoreUserId ? ne(classroomMembers.userId, ignoreUserId) : undefined,
      ),
    );
  if (current.length + displayNames.length > capacity) {
    const free = Math.max(0, capacity - current.length);
    throw new AppError(
      "conflict",
      free === 0
        ? `This classroom is full (${capacity} students). Raise the class size limit or remove a student first.`
        : `This classroom has room for ${free} more student${free === 1 ? "" : "s"} (limit ${capacity}).`,
    );
  }
  const taken = new Map(current.map((m) => [normaliseDisplayName(m.displayName), m.displayName]));
  for (const name of displayNames) {
    const clash = taken.get(normaliseDisplayName(name));
    if (clash) {
      throw new AppError(
        "conflict",
        `"${clash}" is already in this classroom. Add an initial to tell them apart.`,
        {
          issues: [
            {
              path: "displayNames",
              message: `"${clash}" is already in this classroom. Add an initial to tell them apart.`,
            },
          ],
        },
      );
    }
  }
}

async function makeUniqueObserverCodes(tx: Executor, howMany: number): Promise<string[]> {
  const codes = new Set<string>();
  for (let attempt = 0; codes.size < howMany; attempt++) {
    if (attempt > 50) throw new Error("could not find free observer codes");
    const fresh = Array.from({ length: howMany - codes.size }, () => makeObserverCode()).filter(
      (c) => !codes.has(c),
    );
    const used = await tx
      .select({ code: observers.code })
      .from(observers)
      .where(inArray(observers.code, fresh));
    const usedSet = new Set(used.map((u) => u.code));
    for (const code of fresh) if (!usedSet.has(code)) codes.add(code);
  }
  return [...codes];
}

/**
 * Creates student accounts in a classroom, all or none: a user with the
 * student role and no e-mail, an observer profile with no country (we
 * never ask a student where they live), the class instrument and the
 * membership with the PIN's hash. Refuses when the class would go over its
 * limit or a name is already taken, checked inside the same transaction so
 * two educators' tabs cannot overfill it.
 */
export async function createStudentsInClassroom({
  classroomId,
  capacity,
  students,
  instrument,
}: {
  classroomId: string;
  capacity: number;
  students: Array<{ displayName: string; pinHash: string }>;
  instrument: { name: string; kind: InstrumentKind };
}) {
  return getDb().transaction(async (tx) => {
    await assertRoomFor({ tx, classroomId, capacity, displayNames: students.map((s) => s.displayName) });
    const codes = await makeUniqueObserverCodes(tx, students.length);
    const created: Array<{ userId: string; displayName: string }> = [];
    for (const [i, student] of students.entries()) {
      const [user] = await tx
        .insert(users)
        .values({ name: student.displayName, email: null, role: "student" })
        .returning({ id: users.id });
      if (!user) throw new Error("insert returned nothing");
      const [observer] = await tx
        .insert(observers)
        .values({
          userId: user.id,
          displayName: student.displayName,
          code: codes[i] as string,
          country: null,
          timeZone: "UTC",
        })
        .returning({ id: observers.id });
      if (!observer) throw new Error("insert returned nothing");
      await tx
        .insert(instruments)
        .values({ observerId: observer.id, name: instrument.name, kind: instrument.kind });
      await tx.insert(classroomMembers).values({ classroomId, userId: user.id, pinHash: student.pinHash });
      created.push({ userId: user.id, displayName: student.displayName });
    }
    return created;
  });
}

/** Replaces a member's PIN hash; false when the student is not in that classroom. */
export async function setMemberPinHash({
  classroomId,
  userId,
  pinHash,
}: {
  classroomId: string;
  userId: string;
  pinHash: string;
}) {
  const rows = await getDb()
    .update(classroomMembers)
    .set({ pinHash })
    .where(and(eq(classroomMembers.classroomId, classroomId), eq(classroomMembers.userId, userId)))
    .returning({ userId: classroomMembers.userId });
  return rows.length > 0;
}

/** Moves a student to another classroom, refusing a full one or a name clash there. */
export async function moveMember({
  userId,
  fromClassroomId,
  to,
}: {
  userId: string;
  fromClassroomId: string;
  to: { id: string; capacity: number };
}) {
  return getDb().transaction(async (tx) => {
    const [member] = await tx
      .select({ displayName: observers.displayName })
      .from(classroomMembers)
      .innerJoin(observers, eq(observers.userId, classroomMembers.userId))
      .where(and(eq(classroomMembers.classroomId, fromClassroomId), eq(classroomMembers.userId, userId)))
      .limit(1);
    if (!member) return false;
    await assertRoomFor({
      tx,
      classroomId: to.id,
      capacity: to.capacity,
      displayNames: [member.displayName],
      ignoreUserId: userId,
    });
    await tx
      .update(classroomMembers)
      .set({ classroomId: to.id })
      .where(and(eq(classroomMembers.classroomId, fromClassroomId), eq(classroomMembers.userId, userId)));
    return true;
  });
}

/**
 * Deletes a student's account and everything it holds (counts, instruments,
 * membership). Students are likely minors: when they leave, their data goes.
 * Observations are deleted first because they hold their instrument with
 * ON DELETE RESTRICT.
 */
export async function deleteStudentOfClassroom({
  classroomId,
  userId,
}: {
  classroomId: string;
  userId: string;
}) {
  return getDb().transaction(async (tx) => {
    const [member] = await tx
      .select({ observerId: observers.id })
      .from(classroomMembers)
      .innerJoin(observers, eq(observers.userId, classroomMembers.userId))
      .innerJoin(users, eq(users.id, classroomMembers.userId))
      .where(
        and(
          eq(classroomMembers.classroomId, classroomId),
          eq(classroomMembers.userId, userId),
          eq(users.role, "student"),
        ),
      )
      .limit(1);
    if (!member) return false;
    await tx.delete(observations).where(eq(observations.observerId, member.observerId));
    await tx.delete(users).where(eq(users.id, userId));
    return true;
  });
}

// ---------------------------------------------------------------------------
// Sessions
// ---------------------------------------------------------------------------

export type ClassroomSessionRow = typeof classroomSessions.$inferSelect;

export async function insertSession(values: typeof classroomSessions.$inferInsert) {
  const [row] = await getDb().insert(classroomSessions).values(values).returning();
  if (!row) throw new Error("insert returned nothing");
  return row;
}

/** A classroom's sessions, newest first, with how many counts each has. */
export async function listSessionsOfClassroom({ classroomId }: { classroomId: string }) {
  const db = getDb();
  const [sessions, counted] = await Promise.all([
    db
      .select()
      .from(classroomSessions)
      .where(eq(classroomSessions.classroomId, classroomId))
      .orderBy(desc(classroomSessions.day), desc(classroomSessions.opensAt)),
    db
      .select({ sessionId: observations.classSessionId, n: count() })
      .from(observations)
      .innerJoin(classroomSessions, eq(classroomSessions.id, observations.classSessionId))
      .where(eq(classroomSessions.classroomId, classroomId))
      .groupBy(observations.classSessionId),
  ]);
  const byId = new Map(counted.map((c) => [c.sessionId, c.n]));
  return sessions.map((s) => ({ ...s, counts: byId.get(s.id) ?? 0 }));
}

/** A session with its classroom; the caller decides who may see it. */
export async function getSessionWithClassroom({ sessionId }: { sessionId: string }) {
  const [row] = await getDb()
    .select({ session: classroomSessions, classroom: classroomColumns })
    .from(classroomSessions)
    .innerJoin(classrooms, eq(classrooms.id, classroomSessions.classroomId))
    .where(eq(classroomSessions.id, sessionId))
    .limit(1);
  return row ?? null;
}

/** A student's count with their display name, as the classroom's own pages show it. */
const studentCountColumns = {
  userId: observers.userId,
  observerId: observers.id,
  displayName: observers.displayName,
  groups: observations.groups,
  spots: observations.spots,
  seeing: observations.seeing,
  observedAt: observations.observedAt,
};

/** Every count logged for a classroom's sessions, with the student's display name (for use inside that classroom only). */
export async function listClassroomCounts({ classroomId }: { classroomId: string }) {
  return getDb()
    .select({
      observationId: observations.id,
      sessionId: classroomSessions.id,
      day: classroomSessions.day,
      ...studentCountColumns,
    })
    .from(observations)
    .innerJoin(classroomSessions, eq(classroomSessions.id, observations.classSessionId))
    .innerJoin(observers, eq(observers.id, observations.observerId))
    .where(eq(classroomSessions.classroomId, classroomId))
    .orderBy(asc(classroomSessions.day), asc(observers.displayName));
}

export async function listSessionCounts({ sessionId }: { sessionId: string }) {
  return getDb()
    .select({
      observationId: observations.id,
      ...studentCountColumns,
    })
    .from(observations)
    .innerJoin(observers, eq(observers.id, observations.observerId))
    .where(eq(observations.classSessionId, sessionId))
    .orderBy(asc(observers.displayName));
}

/**
 * Counts of several classrooms for comparing classes with each other. No
 * names and no ids of students leave this query: only the classroom, the
 * day and the numbers.
 */
export async function listAnonymousCountsOfClassrooms({ classroomIds }: { classroomIds: string[] }) {
  if (classroomIds.length === 0) return [];
  return getDb()
    .select({
      classroomId: classroomSessions.classroomId,
      sessionId: classroomSessions.id,
      day: classroomSessions.day,
      groups: observations.groups,
      spots: observations.spots,
    })
    .from(observations)
    .innerJoin(classroomSessions, eq(classroomSessions.id, observations.classSessionId))
    .where(inArray(classroomSessions.classroomId, classroomIds))
    .orderBy(asc(classroomSessions.day));
}

/** Classrooms whose educators chose to be compared with other classes. */
export async function listComparableClassrooms() {
  return getDb()
    .select({
      id: classrooms.id,
      educatorUserId: classrooms.educatorUserId,
      name: classrooms.name,
      school: classrooms.school,
      termStart: classrooms.termStart,
      termEnd: classrooms.termEnd,
      archivedAt: classrooms.archivedAt,
    })
    .from(classrooms)
    .where(eq(classrooms.compareWithOthers, true))
    .orderBy(asc(classrooms.school), asc(classrooms.name));
}

/** The network's daily index ("all" hemispheres) on the given days, where it has been computed. */
export async function getNetworkDailyValues({ days }: { days: string[] }) {
  if (days.length === 0) return new Map<string, { mean: number; observers: number }>();
  const rows = await getDb()
    .select({ day: seriesDaily.day, mean: seriesDaily.mean, observers: seriesDaily.observers })
    .from(seriesDaily)
    .where(and(eq(seriesDaily.hemisphere, "all"), inArray(seriesDaily.day, [...new Set(days)])));
  return new Map(rows.map((r) => [r.day, { mean: r.mean, observers: r.observers }]));
}

// ---------------------------------------------------------------------------
// A student's count for a session
// ---------------------------------------------------------------------------

export async function getSessionObservationOfObserver({
  observerId,
  sessionId,
}: {
  observerId: string;
  sessionId: string;
}) {
  const [row] = await getDb()
    .select({
      id: observations.id,
      groups: observations.groups,
      spots: observations.spots,
      observedAt: observations.observedAt,
    })
    .from(observations)
    .where(and(eq(observations.observerId, observerId), eq(observations.classSessionId, sessionId)))
    .limit(1);
  return row ?? null;
}

/**
 * The class session (with its classroom) that one of the observer's own
 * counts was logged for, and the instrument the count is filed under; null
 * for a count logged outside any session, or someone else's.
 */
export async function getSessionOfOwnObservation({
  observerId,
  observationId,
}: {
  observerId: string;
  observationId: string;
}) {
  const [row] = await getDb()
    .select({
      session: classroomSessions,
      classroom: classroomColumns,
      instrumentId: observations.instrumentId,
    })
    .from(observations)
    .innerJoin(classroomSessions, eq(classroomSessions.id, observations.classSessionId))
    .innerJoin(classrooms, eq(classrooms.id, classroomSessions.classroomId))
    .where(and(eq(observations.id, observationId), eq(observations.observerId, observerId)))
    .limit(1);
  return row ?? null;
}

/** The student's counts logged for class sessions, newest first, with the session's title. */
export async function listSessionObservationsOfObserver({ observerId }: { observerId: string }) {
  return getDb()
    .select({
      observationId: observations.id,
      sessionId: classroomSessions.id,
      classroomId: classroomSessions.classroomId,
      title: classroomSessions.title,
      day: classroomSessions.day,
      groups: observations.groups,
      spots: observations.spots,
      observedAt: observations.observedAt,
    })
    .from(observations)
    .innerJoin(classroomSessions, eq(classroomSessions.id, observations.classSessionId))
    .where(and(eq(observations.observerId, observerId), isNotNull(observations.classSessionId)))
    .orderBy(desc(classroomSessions.day));
}

/**
 * The student's instrument for a session: the one with the session's name
 * and kind, made on first use, so every count of the class is filed under
 * what the class actually used.
 */
export async function findOrCreateSessionInstrument({
  observerId,
  name,
  kind,
}: {
  observerId: string;
  name: string;
  kind: InstrumentKind;
}) {
  const db = getDb();
  const [existing] = await db
    .select({ id: instruments.id })
    .from(instruments)
    .where(
      and(eq(instruments.observerId, observerId), eq(instruments.name, name), eq(instruments.kind, kind)),
    )
    .limit(1);
  if (existing) {
    // An archived copy is brought back: the class is using it again.
    await db.update(instruments).set({ archivedAt: null }).where(eq(instruments.id, existing.id));
    return existing.id;
  }
  const [created] = await db
    .insert(instruments)
    .values({ observerId, name, kind, notes: "Set up by the class for a classroom session." })
    .returning({ id: instruments.id });
  if (!created) throw new Error("insert returned nothing");
  return created.id;
}
