import {
  assessBlur,
  DEFAULT_WAVELENGTH_NM,
  diffractionBlurArcsec,
  eyeLimitOnCardArcsec,
  projectedDiskDiameterMm,
  radiansToArcsec,
  requirePositive,
  resolvePlanContext,
} from "./blur";
import type { PinholeOptics, PinholePlan, PlanOptions, PlanWarning } from "./types";

/**
 * Rayleigh's best pinhole, d ≈ 1.9 √(f λ) (Lord Rayleigh 1891, Phil. Mag.;
 * discussed with measurements in M. Young 1971, "Pinhole optics", Applied
 * Optics 10, 2763). Our root-sum-square blur model (blur.ts) is flattest a
 * little lower, near 1.56 √(f λ); the blur changes slowly around the optimum,
 * so we quote Rayleigh's published rule rather than our own model's minimum.
 */
export const RAYLEIGH_PINHOLE_FACTOR = 1.9;

/** Common practice: a pinhole should be well under 1 % of the box length. */
export const PINHOLE_MAX_FRACTION_OF_BOX = 0.01;

/** Our thresholds: beyond these the blur is some 20–30 % worse than at best. */
export const PINHOLE_RATIO_TOO_LARGE = 1.5;
export const PINHOLE_RATIO_TOO_SMALL = 0.5;

export function bestPinholeDiameterMm({
  boxLengthMm,
  wavelengthNm = DEFAULT_WAVELENGTH_NM,
}: {
  boxLengthMm: number;
  wavelengthNm?: number;
}): number {
  requirePositive({ value: boxLengthMm, name: "boxLengthMm" });
  requirePositive({ value: wavelengthNm, name: "wavelengthNm" });
  return RAYLEIGH_PINHOLE_FACTOR * Math.sqrt(boxLengthMm * wavelengthNm * 1e-6);
}

export function planPinhole({
  instrument,
  options,
}: {
  instrument: PinholeOptics;
  options?: PlanOptions;
}): PinholePlan {
  const { holeDiameterMm, boxLengthMm } = instrument;
  requirePositive({ value: holeDiameterMm, name: "holeDiameterMm" });
  requirePositive({ value: boxLengthMm, name: "boxLengthMm" });
  const context = resolvePlanContext({ options });
  const sunDiameterArcsec = context.sun.diameterArcsec;

  const diskDiameterMm = projectedDiskDiameterMm({ distanceMm: boxLengthMm, sunDiameterArcsec });
  // A point on the Sun casts an image of the hole itself on the card.
  const geometricArcsec = radiansToArcsec({ radians: holeDiameterMm / boxLengthMm });
  const base = assessBlur({
    context,
    geometricArcsec,
    diffractionArcsec: diffractionBlurArcsec({
      apertureMm: holeDiameterMm,
      wavelengthNm: context.wavelengthNm,
    }),
    eyeLimitArcsec: eyeLimitOnCardArcsec({ diskDiameterMm, sunDiameterArcsec }),
  });

  const bestHoleDiameterMm = bestPinholeDiameterMm({ boxLengthMm, wavelengthNm: context.wavelengthNm });
  const holeToBestRatio = holeDiameterMm / bestHoleDiameterMm;
  const holeFractionOfBoxLength = holeDiameterMm / boxLengthMm;

  return {
    kind: "pinhole",
    ...base,
    diskDiameterMm,
    bestHoleDiameterMm,
    holeToBestRatio,
    holeFractionOfBoxLength,
    warnings: [
      ...base.warnings,
      ...describePinholeWarnings({ holeToBestRatio, holeFractionOfBoxLength, bestHoleDiameterMm }),
    ],
  };
}

function describePinholeWarnings({
  holeToBestRatio,
  holeFractionOfBoxLength,
  bestHoleDiameterMm,
}: {
  holeToBestRatio: number;
  holeFractionOfBoxLength: number;
  bestHoleDiameterMm: number;
}): PlanWarning[] {
  const warnings: PlanWarning[] = [];
  const best = `${bestHoleDiameterMm.toFixed(2)} mm`;
  if (holeFractionOfBoxLength > PINHOLE_MAX_FRACTION_OF_BOX) {
    warnings.push({
      code: "pinhole-over-one-percent",
      message: `The hole is ${(holeFractionOfBoxLength * 100).toFixed(1)} % of the box length; at 1 % the blur is already wider than the whole disk. Aim for about ${best}.`,
    });
  }
  if (holeToBestRatio > PINHOLE_RATIO_TOO_LARGE) {
    warnings.push({
      code: "pinhole-larger-than-best",
      message: `The hole is ${holeToBestRatio.toFixed(1)} times the best size for this box (${best}); a smaller hole in thin foil will give a sharper disk.`,
    });
  } else if (holeToBestRatio < PINHOLE_RATIO_TOO_SMALL) {
    warnings.push({
      code: "pinhole-smaller-than-best",
      message: `The hole is smaller than half the best size for this box (${best}); diffraction blurs the image and it is dimmer than it need be.`,
    });
  }
  return warnings;
}
