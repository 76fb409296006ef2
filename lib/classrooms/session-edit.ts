import "server-only";

import { getSessionOfOwnObservation } from "@/db/queries/classrooms";
import { formatUt } from "@/lib/format/time";
import { AppError } from "@/lib/http/errors";
import type { ObservationInput } from "@/lib/validation/observation";

import { describeSessionState } from "./session-state";

type SessionWindow = { title: string; day: string; opensAt: Date; closesAt: Date };

const hhmm = (at: Date) => at.toISOString().slice(11, 16);

/** "2026-10-14 10:00–11:00 UT", as the session's messages quote it. */
export function describeWindow(session: SessionWindow): string {
  return `${session.day} ${hhmm(session.opensAt)}–${hhmm(session.closesAt)} UT`;
}

/** The observation time of a session count must lie inside the session's window (answered beside the time field). */
export function assertObservedInWindow({
  session,
  observedAt,
}: {
  session: SessionWindow;
  observedAt: Date;
}) {
  const at = observedAt.getTime();
  if (at < session.opensAt.getTime() || at > session.closesAt.getTime()) {
    const message = `Give the time you counted during the session (${describeWindow(session)}); ${formatUt(observedAt)} is outside it.`;
    throw new AppError("invalid_input", message, { issues: [{ path: "observedAt", message }] });
  }
}

/** Why a session count can no longer be changed, or null while it can. */
function describeLock({
  session,
  classroom,
  now,
}: {
  session: SessionWindow;
  classroom: { archivedAt: Date | null };
  now: Date;
}): string | null {
  if (classroom.archivedAt)
    return "This classroom has finished for the term; its counts can no longer be changed.";
  // A session count exists only from the session's opening on, so "closed" is the one state to refuse.
  if (describeSessionState({ opensAt: session.opensAt, closesAt: session.closesAt, now }) === "closed") {
    return `“${session.title}” closed at ${hhmm(session.closesAt)} UT on ${session.day}, so its counts can no longer be changed or deleted.`;
  }
  return null;
}

/** One of the observer's own counts, at a given moment (now unless a test says otherwise). */
type OwnCount = { observerId: string; observationId: string; now?: Date };

/** The class session a count was logged for, with why it is locked (null while it is not); null for any other count. */
async function findSessionCount({ observerId, observationId, now = new Date() }: OwnCount) {
  const found = await getSessionOfOwnObservation({ observerId, observationId });
  return found ? { ...found, lock: describeLock({ ...found, now }) } : null;
}

/** For pages: why one of the observer's counts is locked by its class session, or null when it is not. */
export async function findSessionCountLock(count: OwnCount): Promise<string | null> {
  return (await findSessionCount(count))?.lock ?? null;
}

/**
 * A count logged for a class session belongs to that session: its student
 * may correct it, trace it or delete it only while the session is open, just
 * as a new count is taken only then, so the class's comparison stays as the
 * class made it. Refused with 409 and nothing changed otherwise. Returns the
 * session (and the instrument the count is filed under) for a session count
 * and null for any other count of the observer (which this rule leaves
 * alone). Only the count's owner reaches the write paths, so educators'
 * rights are untouched.
 */
export async function assertSessionCountChangeable(count: OwnCount) {
  const found = await findSessionCount(count);
  if (!found) return null;
  if (found.lock) throw new AppError("conflict", found.lock);
  return { session: found.session, instrumentId: found.instrumentId };
}

/**
 * What a correction of one of the observer's counts may store: any count
 * passes unchanged, except a session count, which is refused once its session
 * has closed, must keep its observation time inside the window, and stays
 * filed under the session's instrument whatever the form sent (as when it was
 * logged).
 */
export async function checkCountRevision({
  input,
  ...count
}: OwnCount & { input: ObservationInput }): Promise<ObservationInput> {
  const found = await assertSessionCountChangeable(count);
  if (!found) return input;
  assertObservedInWindow({ session: found.session, observedAt: input.observedAt });
  return { ...input, instrumentId: found.instrumentId };
}
