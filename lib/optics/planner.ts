/**
 * The projection planner: one entry point for every instrument kind. The
 * physics lives in one file per kind; this file only dispatches and gathers
 * the public API so callers import from one place.
 */

import { planCamera } from "./camera";
import { planEyepieceProjection } from "./eyepiece-projection";
import { planFilteredTelescope } from "./filtered-telescope";
import { planMirror } from "./mirror";
import { planPinhole } from "./pinhole";
import type { InstrumentOptics, PlanOptions, ProjectionPlan } from "./types";

export function planProjection({
  instrument,
  options,
}: {
  instrument: InstrumentOptics;
  options?: PlanOptions;
}): ProjectionPlan {
  switch (instrument.kind) {
    case "pinhole":
      return planPinhole({ instrument, options });
    case "mirror":
      return planMirror({ instrument, options });
    case "eyepiece-projection":
      return planEyepieceProjection({ instrument, options });
    case "camera":
      return planCamera({ instrument, options });
    case "filtered-telescope":
      return planFilteredTelescope({ instrument, options });
    default: {
      const unknown: never = instrument;
      throw new TypeError(`Unknown instrument kind: ${JSON.stringify((unknown as { kind?: unknown }).kind)}`);
    }
  }
}

export {
  DEFAULT_SEEING_ARCSEC,
  DEFAULT_WAVELENGTH_NM,
  diffractionBlurArcsec,
  projectedDiskDiameterMm,
  SPOT_TO_BLUR_RATIO,
} from "./blur";
export { PIXELS_PER_RESOLVED_DETAIL, planCamera } from "./camera";
export { eyepieceProjectionMagnification, planEyepieceProjection } from "./eyepiece-projection";
export { dawesLimitArcsec, planFilteredTelescope, rayleighLimitArcsec } from "./filtered-telescope";
export {
  bestMaskDiameterMm,
  DEFAULT_TARGET_BLUR_FRACTION,
  describeSecondSurfaceGhost,
  frontSurfaceReflectance,
  maskDiameterForBlurMm,
  mirrorImageElongation,
  planMirror,
  throwDistanceForMaskMm,
} from "./mirror";
export { bestPinholeDiameterMm, planPinhole } from "./pinhole";
export { INSTRUMENT_KINDS } from "./types";
export type * from "./types";
