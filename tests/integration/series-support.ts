/**
 * Invented networks for the series and k integration tests: observers with
 * known k, written straight into the database as accepted counts (the Review
 * desk's job is not under test here).
 */
import { getDb } from "@/db/client";
import { instruments, observations, type NewObservation } from "@/db/schema";
import { formatDayNumber } from "@/lib/counts/series";

import { generateSyntheticNetwork, type SyntheticNetwork } from "../unit/counts/helpers";
import { makeUser } from "./support";

export type Unit = { observerId: string; instrumentId: string; userId: string };

/** One observer (with one instrument) per synthetic id; `secondInstrumentOf` gives some a second instrument as another unit. */
export async function makeUnits({
  ids,
  secondInstruments = {},
}: {
  ids: string[];
  /** synthetic id → the synthetic id whose observer owns this unit as a second instrument */
  secondInstruments?: Record<string, string>;
}): Promise<Map<string, Unit>> {
  const units = new Map<string, Unit>();
  for (const id of ids) {
    if (secondInstruments[id]) continue;
    const made = await makeUser({ role: "observer", name: `Synthetic ${id}` });
    units.set(id, { observerId: made.observer!.id, instrumentId: made.instrument!.id, userId: made.user.id });
  }
  for (const [id, ownerId] of Object.entries(secondInstruments)) {
    const owner = units.get(ownerId)!;
    const [instrument] = await getDb()
      .insert(instruments)
      .values({ observerId: owner.observerId, name: `Second instrument ${id}`, kind: "filtered-telescope" })
      .returning();
    units.set(id, { observerId: owner.observerId, instrumentId: instrument!.id, userId: owner.userId });
  }
  return units;
}

/** Writes the synthetic counts as observations; every third count of split units carries a north/south split. */
export async function insertNetwork({
  network,
  units,
  status = "accepted",
  splitIds = new Set<string>(),
}: {
  network: SyntheticNetwork;
  units: Map<string, Unit>;
  status?: NewObservation["status"];
  splitIds?: Set<string>;
}): Promise<void> {
  const rows: NewObservation[] = network.observations.map((o, i) => {
    const unit = units.get(o.observerId)!;
    const day = formatDayNumber(o.day);
    const split = splitIds.has(o.observerId) && o.groups >= 2 && i % 3 === 0;
    const northGroups = split ? Math.floor(o.groups / 2) : null;
    const northSpots = split ? Math.floor(o.spots / 2) : null;
    return {
      observerId: unit.observerId,
      instrumentId: unit.instrumentId,
      observedAt: new Date(`${day}T10:00:00Z`),
      utDate: day,
      seeing: 3,
      groups: o.groups,
      spots: o.spots,
      northGroups,
      northSpots,
      southGroups: split ? o.groups - northGroups! : null,
      southSpots: split ? o.spots - northSpots! : null,
      status,
      source: "demo",
    };
  });
  for (let start = 0; start < rows.length; start += 500) {
    await getDb()
      .insert(observations)
      .values(rows.slice(start, start + 500));
  }
}

export { generateSyntheticNetwork };
