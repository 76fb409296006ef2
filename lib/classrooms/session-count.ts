import "server-only";

import {
  findOrCreateSessionInstrument,
  getMembershipOfStudent,
  getSessionObservationOfObserver,
  getSessionWithClassroom,
} from "@/db/queries/classrooms";
import type { ObservationView } from "@/db/queries/observations";
import { AppError } from "@/lib/http/errors";
import { submitObservation } from "@/lib/observations/submit";
import type { ObservationInput } from "@/lib/validation/observation";

import { assertObservedInWindow, describeWindow } from "./session-edit";

export const ALREADY_LOGGED =
  "You have already logged your count for this session. Each student logs one count per session.";

/**
 * A student's count for a class session. Refused, with nothing stored, when
 * the session is not in the student's own classroom (404), the classroom is
 * archived, the count arrives outside the session's window, its observation
 * time lies outside the window, or the student already logged one for the
 * session. The count is filed under the instrument set up for the session,
 * whatever the form sent. Changing the count later follows the same window
 * (lib/classrooms/session-edit.ts).
 */
export async function submitSessionCount({
  studentUserId,
  observerId,
  sessionId,
  input,
  now = new Date(),
}: {
  studentUserId: string;
  observerId: string;
  sessionId: string;
  input: ObservationInput;
  now?: Date;
}): Promise<ObservationView> {
  const [found, membership] = await Promise.all([
    getSessionWithClassroom({ sessionId }),
    getMembershipOfStudent({ userId: studentUserId }),
  ]);
  if (!found || !membership || membership.classroom.id !== found.classroom.id) {
    throw new AppError("not_found", "No such session in your classroom.");
  }
  const { session, classroom } = found;
  if (classroom.archivedAt)
    throw new AppError("conflict", "This classroom has finished for the term; no more counts can be logged.");

  const window = describeWindow(session);
  if (now.getTime() < session.opensAt.getTime()) {
    throw new AppError("conflict", `“${session.title}” has not opened yet. Counts can be logged ${window}.`);
  }
  if (now.getTime() > session.closesAt.getTime()) {
    throw new AppError("conflict", `“${session.title}” has closed. Counts could be logged ${window}.`);
  }
  assertObservedInWindow({ session, observedAt: input.observedAt });
  if (await getSessionObservationOfObserver({ observerId, sessionId }))
    throw new AppError("conflict", ALREADY_LOGGED);

  const instrumentId = await findOrCreateSessionInstrument({
    observerId,
    name: session.instrumentName,
    kind: session.instrumentKind,
  });
  try {
    return await submitObservation({
      observerId,
      input: { ...input, instrumentId },
      source: "classroom",
      classSessionId: session.id,
    });
  } catch (error) {
    // Two devices sending at the same moment: the unique index
    // observations(observer_id, class_session_id) lets only one in.
    if (isUniqueViolation(error)) throw new AppError("conflict", ALREADY_LOGGED);
    throw error;
  }
}

function isUniqueViolation(error: unknown): boolean {
  for (let e: unknown = error, depth = 0; e && depth < 5; e = (e as { cause?: unknown }).cause, depth++) {
    const message = (e as { message?: unknown }).message;
    if (
      typeof message === "string" &&
      message.includes("UNIQUE constraint failed") &&
      message.includes("class_session_id")
    )
      return true;
  }
  return false;
}
