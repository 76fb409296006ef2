/**
 * The one number other features take from an instrument: how wide its
 * projected disk is on a given day. The Disk tracer uses it as the default
 * for the printable template and the tracer's scale.
 */

import { readInstrumentOptics } from "@/lib/instruments/profile";
import { solarOrientation } from "@/lib/solar/ephemeris";

import { planProjection } from "./planner";
import type { InstrumentOptics } from "./types";

/** A stored instruments row ({ kind, params }) or optics already parsed. */
export type InstrumentLike = InstrumentOptics | { kind: string; params: unknown };

/**
 * Diameter, in mm, of the Sun's image on the card or wall for `at`, using
 * the ephemeris's semidiameter so it agrees with the template's grid. Null
 * for kinds that do not project onto a card (camera, filtered telescope)
 * and for profiles whose details are missing or do not pass the schema.
 * For a mirror it is the true round size across the plane of incidence; a
 * card parallel to the mirror stretches it along the other axis.
 */
export function getProjectedDiskDiameterMm({
  instrument,
  at,
}: {
  instrument: InstrumentLike;
  at: Date;
}): number | null {
  const optics = "params" in instrument ? readInstrumentOptics(instrument) : instrument;
  if (optics === null) return null;
  if (optics.kind === "camera" || optics.kind === "filtered-telescope") return null;
  try {
    const plan = planProjection({
      instrument: optics,
      options: { semidiameterArcsec: solarOrientation(at).semidiameterArcsec },
    });
    return "diskDiameterMm" in plan ? plan.diskDiameterMm : null;
  } catch (error) {
    // Optics passed in directly skip the schema; the planner refuses what it cannot plan.
    if (error instanceof RangeError) return null;
    throw error;
  }
}
