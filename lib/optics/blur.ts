/**
 * Blur and "smallest spot that will show", shared by every instrument kind.
 *
 * Each source of blur is measured as a full width in arcseconds:
 * - geometric: the aperture's own size seen from the card (pinhole, mirror);
 * - diffraction: the Airy disk out to its first dark ring, 2.44 λ / D
 *   (G. B. Airy 1835); a full width so it adds like the geometric blur;
 * - seeing: the atmosphere, an assumed figure unless the caller gives one.
 * They are combined as a root-sum-square. That is exact only for Gaussian
 * blurs; for a uniform disk plus an Airy pattern it is a common engineering
 * approximation, good to some tens of percent, which is as well as the
 * inputs (a hand-made hole, a paced-out throw) are known anyway.
 */

import { ARCSEC_PER_RADIAN, describeSunForPlanning, type SunForPlanning } from "./sun-size";
import type { Blur, PlanBase, PlanOptions, PlanWarning, SmallestSpot } from "./types";

/** Middle of the visual band, where the eye is most sensitive. */
export const DEFAULT_WAVELENGTH_NM = 550;

/**
 * A fair daytime sky for a small instrument (assumption, not a measurement).
 * Irrelevant for pinholes and mirrors, whose blur is minutes of arc; it
 * dominates for telescopes.
 */
export const DEFAULT_SEEING_ARCSEC = 2;

/** Airy disk diameter to the first dark ring, in units of λ / D. */
export const AIRY_DIAMETER_FACTOR = 2.44;

/**
 * Our own visibility model (an approximation, not from a source): a spot
 * narrower than the blur is smeared over the blur's area, so its darkening
 * falls as (spot / blur)². With a spot-plus-penumbra darkening of about half
 * the photosphere and a card that shows a 3 % dip to a practised eye, the
 * smallest spot that still shows is blur × √(0.03 / 0.5) ≈ a quarter of the blur.
 */
export const SPOT_CONTRAST = 0.5;
export const VISIBLE_CONTRAST = 0.03;
export const SPOT_TO_BLUR_RATIO = Math.sqrt(VISIBLE_CONTRAST / SPOT_CONTRAST);

/**
 * The eye resolves about 1′ (the Snellen standard); a card read from 30 cm
 * therefore shows detail down to about 0.09 mm and no finer.
 */
export const EYE_ACUITY_ARCMIN = 1;
export const CARD_VIEWING_DISTANCE_MM = 300;
export const EYE_DETAIL_ON_CARD_MM = CARD_VIEWING_DISTANCE_MM * ((EYE_ACUITY_ARCMIN / 60) * (Math.PI / 180));

/**
 * Spot sizes for the warnings (order of magnitude, from memory): pores and
 * the spots of young A/B groups are a few arcseconds, up to about 10″;
 * a spot with a well-formed penumbra is some tens of arcseconds, and one
 * over 40″ (about 29,000 km) is among the large ones.
 */
export const SMALL_GROUP_SPOT_ARCSEC = 10;
export const LARGE_SPOT_ARCSEC = 40;

export interface PlanContext {
  sun: SunForPlanning;
  wavelengthNm: number;
  seeingArcsec: number;
}

export function resolvePlanContext({ options = {} }: { options?: PlanOptions }): PlanContext {
  const wavelengthNm = options.wavelengthNm ?? DEFAULT_WAVELENGTH_NM;
  const seeingArcsec = options.seeingArcsec ?? DEFAULT_SEEING_ARCSEC;
  requirePositive({ value: wavelengthNm, name: "wavelengthNm" });
  if (!Number.isFinite(seeingArcsec) || seeingArcsec < 0) {
    throw new RangeError(`seeingArcsec must be zero or more, got ${seeingArcsec}`);
  }
  const sun = describeSunForPlanning({ at: options.at, semidiameterArcsec: options.semidiameterArcsec });
  return { sun, wavelengthNm, seeingArcsec };
}

export function radiansToArcsec({ radians }: { radians: number }): number {
  return radians * ARCSEC_PER_RADIAN;
}

export function diffractionBlurArcsec({
  apertureMm,
  wavelengthNm = DEFAULT_WAVELENGTH_NM,
}: {
  apertureMm: number;
  wavelengthNm?: number;
}): number {
  requirePositive({ value: apertureMm, name: "apertureMm" });
  return radiansToArcsec({ radians: (AIRY_DIAMETER_FACTOR * wavelengthNm * 1e-6) / apertureMm });
}

export function combineBlursArcsec({ blursArcsec }: { blursArcsec: readonly number[] }): number {
  return Math.sqrt(blursArcsec.reduce((sum, b) => sum + b * b, 0));
}

export function describeBlur({
  arcsec,
  sunDiameterArcsec,
}: {
  arcsec: number;
  sunDiameterArcsec: number;
}): Blur {
  return { arcsec, fractionOfDisk: arcsec / sunDiameterArcsec };
}

/** Diameter of the Sun's image at `distanceMm` behind a pinhole, mirror or lens of that focal length. */
export function projectedDiskDiameterMm({
  distanceMm,
  sunDiameterArcsec,
}: {
  distanceMm: number;
  sunDiameterArcsec: number;
}): number {
  return 2 * distanceMm * Math.tan(sunDiameterArcsec / 2 / ARCSEC_PER_RADIAN);
}

/** The finest detail, in arcseconds on the Sun, that the eye can pick out on a card with this disk. */
export function eyeLimitOnCardArcsec({
  diskDiameterMm,
  sunDiameterArcsec,
}: {
  diskDiameterMm: number;
  sunDiameterArcsec: number;
}): number {
  return (EYE_DETAIL_ON_CARD_MM / diskDiameterMm) * sunDiameterArcsec;
}

export function estimateSmallestSpot({
  combinedBlurArcsec,
  eyeLimitArcsec,
  pixelLimitArcsec = 0,
  kmPerArcsec,
}: {
  combinedBlurArcsec: number;
  eyeLimitArcsec: number;
  pixelLimitArcsec?: number;
  kmPerArcsec: number;
}): SmallestSpot {
  const candidates: Array<[number, SmallestSpot["limitedBy"]]> = [
    [combinedBlurArcsec * SPOT_TO_BLUR_RATIO, "blur"],
    [eyeLimitArcsec, "eye"],
    [pixelLimitArcsec, "pixels"],
  ];
  let [arcsec, limitedBy] = candidates[0]!;
  for (const [value, source] of candidates) {
    if (value > arcsec) [arcsec, limitedBy] = [value, source];
  }
  return { arcsec, km: arcsec * kmPerArcsec, limitedBy };
}

/**
 * The blur, seeing and smallest-spot part of every plan, with the warnings
 * that follow from them. Kind-specific warnings are added by the caller.
 */
export function assessBlur({
  context,
  geometricArcsec,
  diffractionArcsec,
  eyeLimitArcsec,
  pixelLimitArcsec,
}: {
  context: PlanContext;
  geometricArcsec: number;
  diffractionArcsec: number | null;
  eyeLimitArcsec: number;
  pixelLimitArcsec?: number;
}): PlanBase {
  const { sun, wavelengthNm, seeingArcsec } = context;
  const sunDiameterArcsec = sun.diameterArcsec;
  const combinedArcsec = combineBlursArcsec({
    blursArcsec: [geometricArcsec, diffractionArcsec ?? 0, seeingArcsec],
  });
  const smallestSpot = estimateSmallestSpot({
    combinedBlurArcsec: combinedArcsec,
    eyeLimitArcsec,
    pixelLimitArcsec,
    kmPerArcsec: sun.kmPerArcsec,
  });
  return {
    sunDiameterArcsec,
    kmPerArcsec: sun.kmPerArcsec,
    wavelengthNm,
    geometricBlur: describeBlur({ arcsec: geometricArcsec, sunDiameterArcsec }),
    diffractionBlur:
      diffractionArcsec === null ? null : describeBlur({ arcsec: diffractionArcsec, sunDiameterArcsec }),
    seeingBlur: describeBlur({ arcsec: seeingArcsec, sunDiameterArcsec }),
    combinedBlur: describeBlur({ arcsec: combinedArcsec, sunDiameterArcsec }),
    smallestSpot,
    warnings: describeSpotWarnings({
      combinedBlurArcsec: combinedArcsec,
      eyeLimitArcsec,
      kmPerArcsec: sun.kmPerArcsec,
    }),
  };
}

function describeSpotWarnings({
  combinedBlurArcsec,
  eyeLimitArcsec,
  kmPerArcsec,
}: {
  combinedBlurArcsec: number;
  eyeLimitArcsec: number;
  kmPerArcsec: number;
}): PlanWarning[] {
  const warnings: PlanWarning[] = [];
  const blurLimitArcsec = combinedBlurArcsec * SPOT_TO_BLUR_RATIO;
  const km = (arcsec: number) =>
    `${(Math.round((arcsec * kmPerArcsec) / 1000) * 1000).toLocaleString("en")} km`;
  if (blurLimitArcsec > LARGE_SPOT_ARCSEC) {
    warnings.push({
      code: "blur-hides-most-spots",
      message: `Only spots wider than about ${Math.round(blurLimitArcsec)}″ (${km(blurLimitArcsec)}) will show: the blur hides everything but the largest spots. Expect low counts; your k coefficient will be high.`,
    });
  } else if (blurLimitArcsec > SMALL_GROUP_SPOT_ARCSEC) {
    warnings.push({
      code: "blur-hides-small-groups",
      message: `Spots smaller than about ${Math.round(blurLimitArcsec)}″ (${km(blurLimitArcsec)}) are blurred away, so small groups of pores will be missed. Counts stay useful; your k coefficient absorbs the difference.`,
    });
  }
  if (eyeLimitArcsec > blurLimitArcsec && eyeLimitArcsec > SMALL_GROUP_SPOT_ARCSEC) {
    warnings.push({
      code: "disk-too-small-for-eye",
      message: `The image is too small for the eye to see everything the optics deliver (finest detail about ${Math.round(eyeLimitArcsec)}″). A larger image would show more: a longer box or throw, or more projection distance.`,
    });
  }
  return warnings;
}

export function requirePositive({ value, name }: { value: number; name: string }): void {
  if (!Number.isFinite(value) || value <= 0)
    throw new RangeError(`${name} must be a positive number, got ${value}`);
}
