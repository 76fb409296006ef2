/**
 * Eyepiece projection: the telescope forms the Sun's image at prime focus
 * and the eyepiece re-images it onto a card behind the eyepiece.
 *
 * Approximation: the eyepiece is treated as a thin lens with the card at
 * distance s from it. A real image at s needs the prime image at
 * u = s·f_e / (s − f_e), so the eyepiece enlarges it by
 *   m = s / u = (s − f_e) / f_e,
 * and the system acts as one lens of effective focal length F × m. Real
 * eyepieces are thick, and observers measure s from the barrel rather than
 * the principal plane; with s some ten times f_e the error is a few percent.
 */

import {
  assessBlur,
  diffractionBlurArcsec,
  eyeLimitOnCardArcsec,
  projectedDiskDiameterMm,
  requirePositive,
  resolvePlanContext,
} from "./blur";
import type { EyepieceProjectionOptics, EyepieceProjectionPlan, PlanOptions, PlanWarning } from "./types";

/**
 * Common practice (no published source): above about 100 mm of aperture the
 * heat at the eyepiece calls for stopping the telescope down.
 */
export const EYEPIECE_HEAT_APERTURE_MM = 100;

export function eyepieceProjectionMagnification({
  eyepieceFocalLengthMm,
  eyepieceToScreenMm,
}: {
  eyepieceFocalLengthMm: number;
  eyepieceToScreenMm: number;
}): number {
  requirePositive({ value: eyepieceFocalLengthMm, name: "eyepieceFocalLengthMm" });
  if (!(eyepieceToScreenMm > eyepieceFocalLengthMm)) {
    throw new RangeError("eyepieceToScreenMm must exceed eyepieceFocalLengthMm, or no real image forms");
  }
  return (eyepieceToScreenMm - eyepieceFocalLengthMm) / eyepieceFocalLengthMm;
}

export function planEyepieceProjection({
  instrument,
  options,
}: {
  instrument: EyepieceProjectionOptics;
  options?: PlanOptions;
}): EyepieceProjectionPlan {
  const { apertureMm, focalLengthMm, eyepieceFocalLengthMm, eyepieceToScreenMm } = instrument;
  requirePositive({ value: apertureMm, name: "apertureMm" });
  requirePositive({ value: focalLengthMm, name: "focalLengthMm" });
  const projectionMagnification = eyepieceProjectionMagnification({
    eyepieceFocalLengthMm,
    eyepieceToScreenMm,
  });
  const context = resolvePlanContext({ options });
  const sunDiameterArcsec = context.sun.diameterArcsec;

  const effectiveFocalLengthMm = focalLengthMm * projectionMagnification;
  const diskDiameterMm = projectedDiskDiameterMm({ distanceMm: effectiveFocalLengthMm, sunDiameterArcsec });
  const base = assessBlur({
    context,
    // In focus: the aperture adds no geometric blur.
    geometricArcsec: 0,
    diffractionArcsec: diffractionBlurArcsec({ apertureMm, wavelengthNm: context.wavelengthNm }),
    eyeLimitArcsec: eyeLimitOnCardArcsec({ diskDiameterMm, sunDiameterArcsec }),
  });

  const warnings: PlanWarning[] = [...base.warnings];
  if (apertureMm > EYEPIECE_HEAT_APERTURE_MM) {
    warnings.push({
      code: "aperture-heats-eyepiece",
      message: `A ${Math.round(apertureMm)} mm aperture concentrates a lot of heat in the eyepiece. Stop the telescope down with an off-axis mask, use an eyepiece without cemented lenses, and never leave it pointed at the Sun.`,
    });
  }

  return {
    kind: "eyepiece-projection",
    ...base,
    projectionMagnification,
    effectiveFocalLengthMm,
    primeFocusDiskDiameterMm: projectedDiskDiameterMm({ distanceMm: focalLengthMm, sunDiameterArcsec }),
    diskDiameterMm,
    warnings,
  };
}
