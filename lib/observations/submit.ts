import "server-only";

import { createObservation, updateObservationOfObserver, type ObservationView } from "@/db/queries/observations";
import { getInstrumentOfObserver } from "@/db/queries/observers";
import type { ObservationSource } from "@/db/schema";
import { AppError } from "@/lib/http/errors";
import type { ObservationInput } from "@/lib/validation/observation";

async function assertOwnInstrument({ observerId, instrumentId }: { observerId: string; instrumentId: string }) {
  const instrument = await getInstrumentOfObserver({ observerId, instrumentId });
  if (!instrument) {
    throw new AppError("invalid_input", "Some fields need attention.", {
      issues: [{ path: "instrumentId", message: "That instrument is not one of yours. Choose one from your list." }],
    });
  }
}

/** Stores a validated observation for its observer; the instrument must be theirs. */
export async function submitObservation({
  observerId,
  input,
  source,
}: {
  observerId: string;
  input: ObservationInput;
  source: ObservationSource;
}): Promise<ObservationView> {
  await assertOwnInstrument({ observerId, instrumentId: input.instrumentId });
  return createObservation({ observerId, input, source });
}

/** Replaces an observation's values; a corrected observation goes back to the review queue. */
export async function reviseObservation({
  observerId,
  observationId,
  input,
}: {
  observerId: string;
  observationId: string;
  input: ObservationInput;
}): Promise<ObservationView> {
  await assertOwnInstrument({ observerId, instrumentId: input.instrumentId });
  const updated = await updateObservationOfObserver({ observerId, observationId, input });
  if (!updated) throw new AppError("not_found", "No such observation in your Logbook.");
  return updated;
}
