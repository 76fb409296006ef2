import "server-only";

import {
  getClassroomOfEducator,
  getMembershipOfStudent,
  getNetworkDailyValues,
  getSessionWithClassroom,
  listAnonymousCountsOfClassrooms,
  listClassroomCounts,
  listClassroomsOfEducator,
  listComparableClassrooms,
  listMembersOfClassroom,
  listSessionCounts,
  listSessionObservationsOfObserver,
  listSessionsOfClassroom,
} from "@/db/queries/classrooms";
import type { KMethod } from "@/lib/counts/k-coefficient";
import { computeRawCount } from "@/lib/counts/relative-number";

import {
  alignClassMedians,
  buildTermTable,
  compareSessionCounts,
  computeClassK,
  computeSessionMedians,
  computeTermKs,
  type TermSessionCounts,
} from "./compare";
import { describeSessionState } from "./session-state";

/**
 * What the classroom pages show, gathered with the caller's right to see it
 * decided here: every loader answers null for anything outside the caller's
 * own classroom, and the page turns null into a 404.
 */

export type Viewer =
  { role: "educator"; userId: string } | { role: "student"; userId: string; observerId: string };

export async function loadSessionComparison({
  sessionId,
  viewer,
  now = new Date(),
}: {
  sessionId: string;
  viewer: Viewer;
  now?: Date;
}) {
  const found = await getSessionWithClassroom({ sessionId });
  if (!found) return null;
  if (viewer.role === "educator" && found.classroom.educatorUserId !== viewer.userId) return null;
  if (viewer.role === "student") {
    const membership = await getMembershipOfStudent({ userId: viewer.userId });
    if (membership?.classroom.id !== found.classroom.id) return null;
  }
  const { session, classroom } = found;
  const state = describeSessionState({ opensAt: session.opensAt, closesAt: session.closesAt, now });
  const counts = await listSessionCounts({ sessionId });
  const own =
    viewer.role === "student" ? (counts.find((c) => c.observerId === viewer.observerId) ?? null) : null;
  // A student sees the others' counts once their own is in, or once the
  // session has closed: the comparison should not become a copying aid.
  const revealed = viewer.role === "educator" || own !== null || state === "closed";
  const network = (await getNetworkDailyValues({ days: [session.day] })).get(session.day) ?? null;
  const comparison = revealed
    ? compareSessionCounts({
        counts: counts.map((c) => ({
          studentId: c.userId,
          displayName: c.displayName,
          groups: c.groups,
          spots: c.spots,
        })),
        networkValue: network?.mean ?? null,
      })
    : null;
  return {
    session,
    classroom: {
      id: classroom.id,
      name: classroom.name,
      school: classroom.school,
      archivedAt: classroom.archivedAt,
    },
    state,
    countsLogged: counts.length,
    own,
    comparison,
    network,
  };
}

/** Sessions with at least one count, as the term statistics want them. */
function toTermSessions(counts: Awaited<ReturnType<typeof listClassroomCounts>>): TermSessionCounts[] {
  const bySession = new Map<
    string,
    TermSessionCounts & { counts: Array<{ studentId: string; raw: number }> }
  >();
  for (const c of counts) {
    const entry = bySession.get(c.sessionId) ?? { sessionId: c.sessionId, day: c.day, counts: [] };
    entry.counts.push({ studentId: c.userId, raw: computeRawCount(c) });
    bySession.set(c.sessionId, entry);
  }
  return [...bySession.values()];
}

export async function loadTermComparison({
  educatorUserId,
  classroomId,
  method = "ratio-of-sums",
}: {
  educatorUserId: string;
  classroomId: string;
  method?: KMethod;
}) {
  const classroom = await getClassroomOfEducator({ educatorUserId, classroomId });
  if (!classroom) return null;
  const [members, counts, sessions] = await Promise.all([
    listMembersOfClassroom({ classroomId }),
    listClassroomCounts({ classroomId }),
    listSessionsOfClassroom({ classroomId }),
  ]);
  const termSessions = toTermSessions(counts);
  const term = computeTermKs({ sessions: termSessions, method });
  // Students who have since moved to another class keep their rows for the
  // sessions they counted here.
  const students = new Map(members.map((m) => [m.userId, m.displayName]));
  for (const c of counts) if (!students.has(c.userId)) students.set(c.userId, c.displayName);
  const studentList = [...students].map(([studentId, displayName]) => ({ studentId, displayName }));
  studentList.sort((a, b) => a.displayName.localeCompare(b.displayName));
  const network = await getNetworkDailyValues({ days: term.medians.map((m) => m.day) });
  const classK = computeClassK({
    days: term.medians.map((m) => ({
      classMedian: m.median,
      networkValue: network.get(m.day)?.mean ?? null,
    })),
    method,
  });
  const titles = new Map(sessions.map((s) => [s.id, s.title]));
  const raws = new Map(termSessions.map((s) => [s.sessionId, s.counts.map((c) => c.raw)]));
  return {
    classroom,
    method,
    students: studentList,
    term,
    medians: term.medians.map((m) => ({
      ...m,
      title: titles.get(m.sessionId) ?? "",
      network: network.get(m.day) ?? null,
      raws: raws.get(m.sessionId) ?? [],
    })),
    table: buildTermTable({ students: studentList, sessions: termSessions, term }),
    classK,
  };
}

/**
 * Classes compared with each other: the class median per session day and
 * each class's k against the network. Only classrooms whose educators opted
 * in take part, and an educator sees the comparison only once one of their
 * own classrooms has opted in. No student name or id is read here.
 */
export async function loadClassComparison({
  educatorUserId,
  method = "ratio-of-sums",
}: {
  educatorUserId: string;
  method?: KMethod;
}) {
  const [rooms, own] = await Promise.all([
    listComparableClassrooms(),
    listClassroomsOfEducator({ educatorUserId }),
  ]);
  const optedIn = own.filter((r) => r.compareWithOthers);
  if (optedIn.length === 0) return { optedIn: false as const, ownCount: own.length };
  const counts = await listAnonymousCountsOfClassrooms({ classroomIds: rooms.map((r) => r.id) });
  const days = [...new Set(counts.map((c) => c.day))];
  const network = await getNetworkDailyValues({ days });
  const classes = rooms.map((room) => {
    const sessions = new Map<
      string,
      TermSessionCounts & { counts: Array<{ studentId: string; raw: number }> }
    >();
    counts
      .filter((c) => c.classroomId === room.id)
      .forEach((c, i) => {
        const entry = sessions.get(c.sessionId) ?? { sessionId: c.sessionId, day: c.day, counts: [] };
        // Anonymous: the statistics need one entry per count, not who made it.
        entry.counts.push({ studentId: String(i), raw: computeRawCount(c) });
        sessions.set(c.sessionId, entry);
      });
    const medians = computeSessionMedians([...sessions.values()]);
    const classK = computeClassK({
      days: medians.map((m) => ({ classMedian: m.median, networkValue: network.get(m.day)?.mean ?? null })),
      method,
    });
    return {
      id: room.id,
      own: room.educatorUserId === educatorUserId,
      label: room.educatorUserId === educatorUserId ? room.name : `${room.name} (${room.school})`,
      sessions: medians.length,
      counts: medians.reduce((sum, m) => sum + m.n, 0),
      medians,
      classK,
    };
  });
  const rows = alignClassMedians(classes).map((row) => ({
    ...row,
    network: network.get(row.day)?.mean ?? null,
  }));
  return { optedIn: true as const, classes, rows, method };
}

/** A student's classroom, its sessions and their own session counts. */
export async function loadStudentClass({
  userId,
  observerId,
  now = new Date(),
}: {
  userId: string;
  observerId: string;
  now?: Date;
}) {
  const membership = await getMembershipOfStudent({ userId });
  if (!membership) return null;
  const { classroom } = membership;
  const [sessions, ownCounts] = await Promise.all([
    listSessionsOfClassroom({ classroomId: classroom.id }),
    listSessionObservationsOfObserver({ observerId }),
  ]);
  const ownBySession = new Map(
    ownCounts.filter((c) => c.classroomId === classroom.id).map((c) => [c.sessionId, c]),
  );
  const withState = sessions.map((s) => ({
    ...s,
    state: describeSessionState({ opensAt: s.opensAt, closesAt: s.closesAt, now }),
    own: ownBySession.get(s.id) ?? null,
  }));
  return {
    classroom: {
      id: classroom.id,
      name: classroom.name,
      school: classroom.school,
      archivedAt: classroom.archivedAt,
    },
    open: withState.filter((s) => s.state === "open"),
    upcoming: withState.filter((s) => s.state === "upcoming").reverse(),
    past: withState.filter((s) => s.state === "closed"),
  };
}
