import "server-only";

import {
  deleteUnusedInstrument,
  findInstrumentOwner,
  getInstrumentWithUsage,
  insertInstrument,
  listInstrumentsWithUsage,
  setInstrumentArchived,
  updateInstrument,
  type InstrumentView,
} from "@/db/queries/instruments";
import { getObserverByUserId } from "@/db/queries/observers";
import { LOGGING_ROLES, roleSatisfies } from "@/lib/auth/roles";
import { requireRole } from "@/lib/auth/session";
import { AppError } from "@/lib/http/errors";
import type { InstrumentInput } from "@/lib/validation/instrument";

import { splitInstrumentInput } from "./profile";

// Someone else's instrument answers exactly like a missing one, so ids cannot be probed.
export const instrumentNotFound = () => new AppError("not_found", "No such instrument in your list.");

export type InstrumentReader = { kind: "owner"; observerId: string } | { kind: "coordinator" };

/**
 * Who may read instrument lists: the owner (observer or student), or a
 * coordinator (or admin) reading any observer's list without changing it.
 * Educators and everyone else are refused.
 */
export async function requireInstrumentReader({ request }: { request?: Request }): Promise<InstrumentReader> {
  const user = await requireRole([...LOGGING_ROLES, "coordinator"], { request });
  if (roleSatisfies({ role: user.role, required: LOGGING_ROLES })) {
    const observer = await getObserverByUserId({ userId: user.id });
    if (!observer) throw new AppError("forbidden", "Your account has no observer profile.");
    return { kind: "owner", observerId: observer.id };
  }
  return { kind: "coordinator" };
}

export async function listInstrumentsForReader({
  reader,
  observerId,
}: {
  reader: InstrumentReader;
  observerId?: string;
}): Promise<InstrumentView[]> {
  if (reader.kind === "owner") return listInstrumentsWithUsage({ observerId: reader.observerId });
  if (!observerId) {
    throw new AppError("bad_request", "Name the observer whose instruments you want: ?observerId=…");
  }
  return listInstrumentsWithUsage({ observerId });
}

export async function createInstrument({
  observerId,
  input,
}: {
  observerId: string;
  input: InstrumentInput;
}): Promise<InstrumentView> {
  return insertInstrument({ observerId, record: splitInstrumentInput({ input }) });
}

export async function reviseInstrument({
  observerId,
  instrumentId,
  input,
}: {
  observerId: string;
  instrumentId: string;
  input: InstrumentInput;
}): Promise<InstrumentView> {
  const outcome = await updateInstrument({
    observerId,
    instrumentId,
    record: splitInstrumentInput({ input }),
  });
  if (outcome.status === "not-found") throw instrumentNotFound();
  if (outcome.status === "kind-locked") {
    throw new AppError("conflict", "Some fields need attention.", {
      issues: [
        {
          path: "kind",
          message: `${outcome.observationCount} of your observations were made with this instrument, so its kind stays as it is. Archive it and add a new instrument instead.`,
        },
      ],
    });
  }
  return outcome.instrument;
}

export async function archiveInstrument({
  observerId,
  instrumentId,
  archived,
}: {
  observerId: string;
  instrumentId: string;
  archived: boolean;
}): Promise<InstrumentView> {
  const instrument = await setInstrumentArchived({ observerId, instrumentId, archived });
  if (!instrument) throw instrumentNotFound();
  return instrument;
}

export async function removeInstrument({
  observerId,
  instrumentId,
}: {
  observerId: string;
  instrumentId: string;
}): Promise<void> {
  const outcome = await deleteUnusedInstrument({ observerId, instrumentId });
  if (outcome.status === "not-found") throw instrumentNotFound();
  if (outcome.status === "in-use") {
    throw new AppError(
      "conflict",
      `${outcome.observationCount} of your observations were made with this instrument, so it cannot be deleted. Archive it instead: it leaves your lists but stays on those observations.`,
    );
  }
}

export async function getOwnInstrument({
  observerId,
  instrumentId,
}: {
  observerId: string;
  instrumentId: string;
}): Promise<InstrumentView> {
  const instrument = await getInstrumentWithUsage({ observerId, instrumentId });
  if (!instrument) throw instrumentNotFound();
  return instrument;
}

/** One instrument as a reader may see it: their own, or any for a coordinator. */
export async function getInstrumentForReader({
  reader,
  instrumentId,
}: {
  reader: InstrumentReader;
  instrumentId: string;
}): Promise<InstrumentView> {
  const observerId =
    reader.kind === "owner" ? reader.observerId : await findInstrumentOwner({ instrumentId });
  if (!observerId) throw instrumentNotFound();
  return getOwnInstrument({ observerId, instrumentId });
}
