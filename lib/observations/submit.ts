import "server-only";

import { createObservation, getObservationOfObserver, type ObservationView } from "@/db/queries/observations";
import { getInstrumentOfObserver } from "@/db/queries/observers";
import { flagNewObservation, resubmitObservation } from "@/db/queries/review";
import type { ObservationSource } from "@/db/schema";
import { checkCountRevision } from "@/lib/classrooms/session-edit";
import { AppError } from "@/lib/http/errors";
import { refreshSeriesAfterDecision } from "@/lib/review/decide";
import type { ObservationInput } from "@/lib/validation/observation";

async function assertOwnInstrument({
  observerId,
  instrumentId,
}: {
  observerId: string;
  instrumentId: string;
}) {
  const instrument = await getInstrumentOfObserver({ observerId, instrumentId });
  if (!instrument) {
    throw new AppError("invalid_input", "Some fields need attention.", {
      issues: [
        { path: "instrumentId", message: "That instrument is not one of yours. Choose one from your list." },
      ],
    });
  }
}

/** Stores a validated observation for its observer; the instrument must be theirs. */
export async function submitObservation({
  observerId,
  input,
  source,
  classSessionId = null,
}: {
  observerId: string;
  input: ObservationInput;
  source: ObservationSource;
  /** A classroom session the count belongs to (lib/classrooms/session-count.ts checks it first). */
  classSessionId?: string | null;
}): Promise<ObservationView> {
  await assertOwnInstrument({ observerId, instrumentId: input.instrumentId });
  const created = await createObservation({ observerId, input, source, classSessionId });
  // Flags are derived data (recomputable at any time), so they are written
  // just after the count rather than holding its insert open.
  await flagNewObservation({ observationId: created.id });
  return created;
}

/**
 * Replaces an observation's values; a corrected observation goes back to the
 * review queue. A class-session count follows its session's rules (refused
 * once the session has closed).
 */
export async function reviseObservation({
  observerId,
  observationId,
  input: sent,
}: {
  observerId: string;
  observationId: string;
  input: ObservationInput;
}): Promise<ObservationView> {
  const input = await checkCountRevision({ observerId, observationId, input: sent });
  await assertOwnInstrument({ observerId, instrumentId: input.instrumentId });
  // Values, status, the "resubmitted" audit line and fresh flags change together.
  const revised = await resubmitObservation({ observerId, observationId, input });
  if (!revised) throw new AppError("not_found", "No such observation in your Logbook.");
  // An accepted count leaves the series until it is accepted again.
  if (revised.before.status === "accepted") {
    await refreshSeriesAfterDecision({ days: [revised.before.utDate, revised.utDate] });
  }
  const updated = await getObservationOfObserver({ observerId, observationId });
  if (!updated) throw new AppError("not_found", "No such observation in your Logbook.");
  return updated;
}
