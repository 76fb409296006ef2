import "server-only";

import {
  createStudentsInClassroom,
  deleteStudentOfClassroom,
  getClassroomOfEducator,
  insertClassroom,
  insertSession,
  isJoinCodeTaken,
  listSessionsOfClassroom,
  moveMember,
  setMemberPinHash,
  updateClassroomOfEducator,
  type ClassroomRow,
} from "@/db/queries/classrooms";
import type { InstrumentKind } from "@/db/schema";
import { AppError } from "@/lib/http/errors";
import type {
  ClassroomInput,
  ClassroomSettingsInput,
  EnrolStudentsInput,
  SessionInput,
} from "@/lib/validation/classroom";

import { makeJoinCode, makePin } from "./codes";
import { hashPin } from "./pins";

/**
 * What an educator can do with their classrooms. Every function takes the
 * acting educator and finds the classroom through them, so another
 * educator's classroom is simply "not found" (404), never "forbidden": ids
 * cannot be probed.
 */

export const DEFAULT_CLASS_INSTRUMENT: { name: string; kind: InstrumentKind } = {
  name: "Class pinhole box",
  kind: "pinhole",
};

const NOT_FOUND = "No such classroom among yours.";

export async function requireOwnClassroom({
  educatorUserId,
  classroomId,
}: {
  educatorUserId: string;
  classroomId: string;
}) {
  const room = await getClassroomOfEducator({ educatorUserId, classroomId });
  if (!room) throw new AppError("not_found", NOT_FOUND);
  return room;
}

function assertNotArchived(room: ClassroomRow) {
  if (room.archivedAt) {
    throw new AppError("conflict", "This classroom is archived: its data can be read but not changed.");
  }
}

export async function createClassroom({
  educatorUserId,
  input,
}: {
  educatorUserId: string;
  input: ClassroomInput;
}) {
  for (let attempt = 0; attempt < 20; attempt++) {
    const joinCode = makeJoinCode();
    if (await isJoinCodeTaken({ joinCode })) continue;
    return insertClassroom({
      educatorUserId,
      name: input.name,
      school: input.school,
      termStart: input.termStart,
      termEnd: input.termEnd,
      capacity: input.capacity,
      joinCode,
    });
  }
  throw new AppError("unavailable", "No free classroom code could be found just now. Try again.");
}

export async function updateClassroomSettings({
  educatorUserId,
  input,
}: {
  educatorUserId: string;
  input: ClassroomSettingsInput;
}) {
  const room = await requireOwnClassroom({ educatorUserId, classroomId: input.classroomId });
  assertNotArchived(room);
  await updateClassroomOfEducator({
    educatorUserId,
    classroomId: room.id,
    set: { joinOpen: input.joinOpen, compareWithOthers: input.compareWithOthers, capacity: input.capacity },
  });
}

/** End of term: no more joining, sessions or sign-ins; the educator can still read everything. */
export async function archiveClassroom({
  educatorUserId,
  classroomId,
  now = new Date(),
}: {
  educatorUserId: string;
  classroomId: string;
  now?: Date;
}) {
  const room = await requireOwnClassroom({ educatorUserId, classroomId });
  assertNotArchived(room);
  await updateClassroomOfEducator({ educatorUserId, classroomId, set: { archivedAt: now, joinOpen: false } });
}

/** The instrument new students get: what the class used most recently, else a pinhole box. */
export async function classInstrumentOf(classroomId: string) {
  const [latest] = await listSessionsOfClassroom({ classroomId });
  return latest ? { name: latest.instrumentName, kind: latest.instrumentKind } : DEFAULT_CLASS_INSTRUMENT;
}

export type IssuedCard = { userId: string; displayName: string; pin: string };

/**
 * Creates student accounts with fresh PINs. The PINs are returned once, for
 * the sign-in cards, and only their hashes are stored.
 */
export async function enrolStudents({
  educatorUserId,
  input,
}: {
  educatorUserId: string;
  input: EnrolStudentsInput;
}): Promise<IssuedCard[]> {
  const room = await requireOwnClassroom({ educatorUserId, classroomId: input.classroomId });
  assertNotArchived(room);
  const pins = input.displayNames.map(() => makePin());
  const pinHashes: string[] = [];
  for (const pin of pins) pinHashes.push(await hashPin(pin));
  const created = await createStudentsInClassroom({
    classroomId: room.id,
    capacity: room.capacity,
    students: input.displayNames.map((displayName, i) => ({ displayName, pinHash: pinHashes[i] as string })),
    instrument: await classInstrumentOf(room.id),
  });
  return created.map((c, i) => ({ ...c, pin: pins[i] as string }));
}

export async function resetStudentPin({
  educatorUserId,
  classroomId,
  studentUserId,
}: {
  educatorUserId: string;
  classroomId: string;
  studentUserId: string;
}): Promise<{ userId: string; pin: string }> {
  const room = await requireOwnClassroom({ educatorUserId, classroomId });
  assertNotArchived(room);
  const pin = makePin();
  const ok = await setMemberPinHash({
    classroomId: room.id,
    userId: studentUserId,
    pinHash: await hashPin(pin),
  });
  if (!ok) throw new AppError("not_found", "No such student in this classroom.");
  return { userId: studentUserId, pin };
}

export async function moveStudent({
  educatorUserId,
  classroomId,
  studentUserId,
  targetClassroomId,
}: {
  educatorUserId: string;
  classroomId: string;
  studentUserId: string;
  targetClassroomId: string;
}) {
  const room = await requireOwnClassroom({ educatorUserId, classroomId });
  const target = await getClassroomOfEducator({ educatorUserId, classroomId: targetClassroomId });
  if (!target) {
    throw new AppError("not_found", "Choose one of your own classrooms to move the student to.", {
      issues: [{ path: "targetClassroomId", message: "Choose one of your own classrooms." }],
    });
  }
  assertNotArchived(room);
  if (target.archivedAt) {
    throw new AppError("conflict", "That classroom is archived; students cannot be moved into it.", {
      issues: [{ path: "targetClassroomId", message: "That classroom is archived." }],
    });
  }
  const moved = await moveMember({
    userId: studentUserId,
    fromClassroomId: room.id,
    to: { id: target.id, capacity: target.capacity },
  });
  if (!moved) throw new AppError("not_found", "No such student in this classroom.");
}

/** Removes a student: their account and their counts are deleted. */
export async function removeStudent({
  educatorUserId,
  classroomId,
  studentUserId,
}: {
  educatorUserId: string;
  classroomId: string;
  studentUserId: string;
}) {
  const room = await requireOwnClassroom({ educatorUserId, classroomId });
  const removed = await deleteStudentOfClassroom({ classroomId: room.id, userId: studentUserId });
  if (!removed) throw new AppError("not_found", "No such student in this classroom.");
}

export async function scheduleSession({
  educatorUserId,
  input,
}: {
  educatorUserId: string;
  input: SessionInput;
}) {
  const room = await requireOwnClassroom({ educatorUserId, classroomId: input.classroomId });
  assertNotArchived(room);
  if (input.day < room.termStart || input.day > room.termEnd) {
    throw new AppError("invalid_input", "Some fields need attention.", {
      issues: [
        { path: "day", message: `Choose a day within the term (${room.termStart} to ${room.termEnd}).` },
      ],
    });
  }
  return insertSession({
    classroomId: room.id,
    title: input.title,
    day: input.day,
    opensAt: input.opensAtUt,
    closesAt: input.closesAtUt,
    instrumentName: input.instrumentName,
    instrumentKind: input.instrumentKind,
  });
}
