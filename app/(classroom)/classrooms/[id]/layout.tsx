import { notFound } from "next/navigation";

import { getClassroomOfEducator } from "@/db/queries/classrooms";
import { requirePageRole } from "@/lib/auth/page-guard";

/**
 * Every page of one classroom: another educator's classroom is answered
 * exactly like a missing one. Checked here, above the pages' loading
 * screens, so the answer carries a real 404 status before anything streams.
 */
export default async function ClassroomLayout({
  children,
  params,
}: {
  children: React.ReactNode;
  params: Promise<{ id: string }>;
}) {
  const [{ id }, user] = await Promise.all([params, requirePageRole(["educator"])]);
  if (!(await getClassroomOfEducator({ educatorUserId: user.id, classroomId: id }))) notFound();
  return children;
}
