/**
 * A camera behind a full-aperture solar filter: the disk lands on the sensor
 * at prime focus, and the pixels rather than the eye set the finest detail.
 */

import {
  assessBlur,
  diffractionBlurArcsec,
  projectedDiskDiameterMm,
  radiansToArcsec,
  requirePositive,
  resolvePlanContext,
} from "./blur";
import { describeFilterWarnings } from "./filter-warnings";
import type { CameraOptics, CameraPlan, PlanOptions, PlanWarning } from "./types";

/** Nyquist: a detail needs about two pixels to be told from noise. */
export const PIXELS_PER_RESOLVED_DETAIL = 2;

export function planCamera({
  instrument,
  options,
}: {
  instrument: CameraOptics;
  options?: PlanOptions;
}): CameraPlan {
  const { focalLengthMm, pixelSizeUm, apertureMm, filter } = instrument;
  requirePositive({ value: focalLengthMm, name: "focalLengthMm" });
  requirePositive({ value: pixelSizeUm, name: "pixelSizeUm" });
  const context = resolvePlanContext({ options });
  const sunDiameterArcsec = context.sun.diameterArcsec;

  const diskDiameterOnSensorMm = projectedDiskDiameterMm({ distanceMm: focalLengthMm, sunDiameterArcsec });
  const pixelSizeMm = pixelSizeUm / 1000;
  const pixelScaleArcsec = radiansToArcsec({ radians: pixelSizeMm / focalLengthMm });
  const base = assessBlur({
    context,
    geometricArcsec: 0,
    diffractionArcsec:
      apertureMm === undefined
        ? null
        : diffractionBlurArcsec({ apertureMm, wavelengthNm: context.wavelengthNm }),
    // The image is inspected on a screen at any zoom, so the eye is no limit.
    eyeLimitArcsec: 0,
    pixelLimitArcsec: PIXELS_PER_RESOLVED_DETAIL * pixelScaleArcsec,
  });

  const warnings: PlanWarning[] = [...base.warnings, ...describeFilterWarnings({ filter })];
  if (base.smallestSpot.limitedBy === "pixels") {
    warnings.push({
      code: "pixels-limit-detail",
      message: `Each pixel covers ${pixelScaleArcsec.toFixed(1)}″ of the Sun, coarser than the optics deliver; a longer focal length would show smaller spots.`,
    });
  }

  return {
    kind: "camera",
    ...base,
    diskDiameterOnSensorMm,
    diskDiameterPx: diskDiameterOnSensorMm / pixelSizeMm,
    pixelScaleArcsec,
    warnings,
  };
}
