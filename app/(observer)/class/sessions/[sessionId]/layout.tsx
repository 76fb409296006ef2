import { notFound } from "next/navigation";

import { getMembershipOfStudent, getSessionWithClassroom } from "@/db/queries/classrooms";
import { requirePageRole } from "@/lib/auth/page-guard";

/**
 * A session page exists for a student only in their own classroom; any other
 * session is answered like a missing one, with a real 404 status (checked
 * here, above the page's loading screen).
 */
export default async function StudentSessionLayout({
  children,
  params,
}: {
  children: React.ReactNode;
  params: Promise<{ sessionId: string }>;
}) {
  const [{ sessionId }, user] = await Promise.all([params, requirePageRole(["student"])]);
  const [found, membership] = await Promise.all([
    getSessionWithClassroom({ sessionId }),
    getMembershipOfStudent({ userId: user.id }),
  ]);
  if (!found || !membership || found.classroom.id !== membership.classroom.id) notFound();
  return children;
}
