import "server-only";

import { count, eq } from "drizzle-orm";

import { getDb } from "../client";
import { classroomMembers, classrooms } from "../schema";

/** An educator sees only their own classrooms. */
export async function listClassroomsOfEducator({ educatorUserId }: { educatorUserId: string }) {
  return getDb()
    .select({
      id: classrooms.id,
      name: classrooms.name,
      school: classrooms.school,
      termStart: classrooms.termStart,
      termEnd: classrooms.termEnd,
      joinCode: classrooms.joinCode,
      archivedAt: classrooms.archivedAt,
      students: count(classroomMembers.userId),
    })
    .from(classrooms)
    .leftJoin(classroomMembers, eq(classroomMembers.classroomId, classrooms.id))
    .where(eq(classrooms.educatorUserId, educatorUserId))
    .groupBy(classrooms.id)
    .orderBy(classrooms.name);
}
