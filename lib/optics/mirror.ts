/**
 * Mirror projection: a small flat mirror, usually masked down to a round
 * opening, throws the Sun's image across a room onto a card or wall.
 *
 * A flat mirror behaves as a pinhole the size of its opening, so the blur is
 * the opening seen from the card (geometric) plus its diffraction. The
 * angle of incidence i changes things along the plane of incidence only, and
 * we model it as an approximation in three parts:
 * 1. The card. We assume the beam meets the card at the same angle i as the
 *    sunlight meets the mirror (card parallel to the mirror, as with a mirror
 *    on a sill lighting the ceiling). The disk, and every blur on it, is then
 *    stretched by 1 / cos i along that axis. A card square to the beam shows
 *    a round disk and none of this stretch.
 * 2. The opening. Seen from the beam the round opening is an ellipse
 *    d × d cos i: along the plane it acts as a smaller aperture, so its
 *    geometric blur shrinks and its diffraction grows as 1 / cos i.
 * 3. Second-surface (ordinary glass) mirrors. The front of the glass
 *    reflects a ghost image beside the main one; its brightness rises
 *    steeply at glancing incidence (Fresnel equations, any optics text,
 *    e.g. E. Hecht, Optics).
 * Not modelled: how flat the mirror really is. The trade's experience that a
 * glancing reflection blurs more is reproduced here through the stretch on
 * the card, the growing diffraction and the ghost; a first-surface mirror
 * with a large opening loses almost nothing in angular terms.
 */

import {
  AIRY_DIAMETER_FACTOR,
  assessBlur,
  combineBlursArcsec,
  DEFAULT_WAVELENGTH_NM,
  describeBlur,
  diffractionBlurArcsec,
  eyeLimitOnCardArcsec,
  projectedDiskDiameterMm,
  radiansToArcsec,
  requirePositive,
  resolvePlanContext,
  type PlanContext,
} from "./blur";
import { ARCSEC_PER_RADIAN, MEAN_SEMIDIAMETER_ARCSEC } from "./sun-size";
import type { MirrorAxisBlur, MirrorOptics, MirrorPlan, PlanOptions, PlanWarning } from "./types";

/**
 * What the trade's rule of thumb delivers: a ¼-inch (6 mm) opening at 35 ft
 * (10.7 m) blurs about 6–7 % of the disk once diffraction is included.
 */
export const DEFAULT_TARGET_BLUR_FRACTION = 0.07;

/** Our threshold: from here the disk is stretched to twice its width and the ghost of ordinary mirrors passes 10 %. */
export const GLANCING_INCIDENCE_DEG = 60;

/** Soda-lime glass. */
export const MIRROR_GLASS_REFRACTIVE_INDEX = 1.52;
/** Household mirrors are 3–6 mm glass (assumption). */
export const DEFAULT_MIRROR_GLASS_THICKNESS_MM = 4;
/** Silvered or aluminised back coating seen through the glass (assumption). */
export const BACK_COATING_REFLECTANCE = 0.9;

const MEAN_SUN_DIAMETER_ARCSEC = 2 * MEAN_SEMIDIAMETER_ARCSEC;
const DEG = Math.PI / 180;

/** How much longer the disk is along the plane of incidence than across it, on a card parallel to the mirror. */
export function mirrorImageElongation({ incidenceAngleDeg }: { incidenceAngleDeg: number }): number {
  requireIncidence({ incidenceAngleDeg });
  return 1 / Math.cos(incidenceAngleDeg * DEG);
}

/**
 * The opening with the least combined blur at this throw: where geometric
 * blur d / L equals diffraction 2.44 λ / d, d = √(2.44 λ L). This is our
 * root-sum-square model's optimum; Rayleigh's pinhole rule (pinhole.ts) puts
 * it a little larger, at 1.9 √(λ L). Either way the blur is then
 * √2 × √(2.44 λ / L): the least any opening can do at that throw.
 */
export function bestMaskDiameterMm({
  throwDistanceMm,
  wavelengthNm = DEFAULT_WAVELENGTH_NM,
}: {
  throwDistanceMm: number;
  wavelengthNm?: number;
}): number {
  requirePositive({ value: throwDistanceMm, name: "throwDistanceMm" });
  return Math.sqrt(AIRY_DIAMETER_FACTOR * wavelengthNm * 1e-6 * throwDistanceMm);
}

/**
 * Largest mask that keeps the combined geometric and diffraction blur under
 * `blurFraction` of the disk at this throw, on both axes. Solving
 * (d/L)² + (2.44 λ/d)² = (F θ)² for d gives a largest and a smallest
 * opening; the largest is returned (the brightest image). The along-plane
 * axis, where the opening looks d cos i wide, raises the smallest usable
 * opening to d_min / cos i. Null when no opening will do at this throw.
 */
export function maskDiameterForBlurMm({
  throwDistanceMm,
  blurFraction,
  incidenceAngleDeg = 0,
  sunDiameterArcsec = MEAN_SUN_DIAMETER_ARCSEC,
  wavelengthNm = DEFAULT_WAVELENGTH_NM,
}: {
  throwDistanceMm: number;
  blurFraction: number;
  incidenceAngleDeg?: number;
  sunDiameterArcsec?: number;
  wavelengthNm?: number;
}): number | null {
  requirePositive({ value: throwDistanceMm, name: "throwDistanceMm" });
  requirePositive({ value: blurFraction, name: "blurFraction" });
  requireIncidence({ incidenceAngleDeg });
  const allowedRad = (blurFraction * sunDiameterArcsec) / ARCSEC_PER_RADIAN;
  const diffractionMm = AIRY_DIAMETER_FACTOR * wavelengthNm * 1e-6;
  const a = allowedRad ** 2;
  const discriminant = a * a - (4 * diffractionMm ** 2) / throwDistanceMm ** 2;
  if (discriminant < 0) return null;
  const largestMm = Math.sqrt((throwDistanceMm ** 2 / 2) * (a + Math.sqrt(discriminant)));
  const smallestMm = Math.sqrt((throwDistanceMm ** 2 / 2) * (a - Math.sqrt(discriminant)));
  return largestMm * Math.cos(incidenceAngleDeg * DEG) >= smallestMm ? largestMm : null;
}

/**
 * Throw at which an opening of `maskDiameterMm` meets `blurFraction` on both
 * axes: L = d / √((F θ)² − (2.44 λ / d)²), with d cos i on the along-plane
 * axis. Null when diffraction alone already exceeds the target, for that
 * opening no throw is long enough.
 */
export function throwDistanceForMaskMm({
  maskDiameterMm,
  blurFraction,
  incidenceAngleDeg = 0,
  sunDiameterArcsec = MEAN_SUN_DIAMETER_ARCSEC,
  wavelengthNm = DEFAULT_WAVELENGTH_NM,
}: {
  maskDiameterMm: number;
  blurFraction: number;
  incidenceAngleDeg?: number;
  sunDiameterArcsec?: number;
  wavelengthNm?: number;
}): number | null {
  requirePositive({ value: maskDiameterMm, name: "maskDiameterMm" });
  requirePositive({ value: blurFraction, name: "blurFraction" });
  requireIncidence({ incidenceAngleDeg });
  const allowedRad = (blurFraction * sunDiameterArcsec) / ARCSEC_PER_RADIAN;
  const diffractionMm = AIRY_DIAMETER_FACTOR * wavelengthNm * 1e-6;
  const throwForOpening = (openingMm: number): number | null => {
    const geometricRoom = allowedRad ** 2 - (diffractionMm / openingMm) ** 2;
    return geometricRoom > 0 ? openingMm / Math.sqrt(geometricRoom) : null;
  };
  const across = throwForOpening(maskDiameterMm);
  const along = throwForOpening(maskDiameterMm * Math.cos(incidenceAngleDeg * DEG));
  return across === null || along === null ? null : Math.max(across, along);
}

/** Unpolarised reflectance of a bare glass surface (Fresnel equations). */
export function frontSurfaceReflectance({
  incidenceAngleDeg,
  refractiveIndex = MIRROR_GLASS_REFRACTIVE_INDEX,
}: {
  incidenceAngleDeg: number;
  refractiveIndex?: number;
}): number {
  requireIncidence({ incidenceAngleDeg });
  const cosI = Math.cos(incidenceAngleDeg * DEG);
  const sinT = Math.sin(incidenceAngleDeg * DEG) / refractiveIndex;
  const cosT = Math.sqrt(1 - sinT * sinT);
  const rs = (cosI - refractiveIndex * cosT) / (cosI + refractiveIndex * cosT);
  const rp = (cosT - refractiveIndex * cosI) / (cosT + refractiveIndex * cosI);
  return (rs * rs + rp * rp) / 2;
}

/**
 * The ghost of a second-surface mirror: the beam reflected by the front of
 * the glass runs parallel to the main one, offset by 2 t tan r cos i
 * (r the angle inside the glass), and its brightness relative to the main
 * beam is R / ((1 − R)² R_back), absorption in the glass ignored.
 */
export function describeSecondSurfaceGhost({
  incidenceAngleDeg,
  glassThicknessMm = DEFAULT_MIRROR_GLASS_THICKNESS_MM,
  refractiveIndex = MIRROR_GLASS_REFRACTIVE_INDEX,
}: {
  incidenceAngleDeg: number;
  glassThicknessMm?: number;
  refractiveIndex?: number;
}): { offsetMm: number; relativeBrightness: number } {
  requirePositive({ value: glassThicknessMm, name: "glassThicknessMm" });
  const front = frontSurfaceReflectance({ incidenceAngleDeg, refractiveIndex });
  const insideRad = Math.asin(Math.sin(incidenceAngleDeg * DEG) / refractiveIndex);
  return {
    offsetMm: 2 * glassThicknessMm * Math.tan(insideRad) * Math.cos(incidenceAngleDeg * DEG),
    relativeBrightness: front / ((1 - front) ** 2 * BACK_COATING_REFLECTANCE),
  };
}

export function planMirror({
  instrument,
  options,
}: {
  instrument: MirrorOptics;
  options?: PlanOptions;
}): MirrorPlan {
  const { mirrorSizeMm, maskDiameterMm, throwDistanceMm, incidenceAngleDeg, surface } = instrument;
  requirePositive({ value: mirrorSizeMm, name: "mirrorSizeMm" });
  requirePositive({ value: throwDistanceMm, name: "throwDistanceMm" });
  if (maskDiameterMm !== undefined) requirePositive({ value: maskDiameterMm, name: "maskDiameterMm" });
  const elongation = mirrorImageElongation({ incidenceAngleDeg });
  const context = resolvePlanContext({ options });
  const sunDiameterArcsec = context.sun.diameterArcsec;
  const targetBlurFraction = options?.targetBlurFraction ?? DEFAULT_TARGET_BLUR_FRACTION;
  requirePositive({ value: targetBlurFraction, name: "targetBlurFraction" });

  // A mask wider than the mirror cannot widen it.
  const apertureMm = Math.min(maskDiameterMm ?? mirrorSizeMm, mirrorSizeMm);
  const acrossPlane = describeAxisBlur({ context, openingMm: apertureMm, throwDistanceMm, stretch: 1 });
  const alongPlane = describeAxisBlur({
    context,
    openingMm: apertureMm / elongation,
    throwDistanceMm,
    stretch: elongation,
  });
  const worse = alongPlane.combinedBlur.arcsec > acrossPlane.combinedBlur.arcsec ? alongPlane : acrossPlane;

  const diskDiameterMm = projectedDiskDiameterMm({ distanceMm: throwDistanceMm, sunDiameterArcsec });
  const base = assessBlur({
    context,
    geometricArcsec: worse.geometricBlur.arcsec,
    diffractionArcsec: worse.diffractionBlur.arcsec,
    // The unstretched axis is the one the eye struggles with.
    eyeLimitArcsec: eyeLimitOnCardArcsec({ diskDiameterMm, sunDiameterArcsec }),
  });

  const sizing = {
    blurFraction: targetBlurFraction,
    incidenceAngleDeg,
    sunDiameterArcsec,
    wavelengthNm: context.wavelengthNm,
  };
  const maskForTargetBlurMm = maskDiameterForBlurMm({ throwDistanceMm, ...sizing });
  const throwForTargetBlurMm = throwDistanceForMaskMm({ maskDiameterMm: apertureMm, ...sizing });
  const ghost =
    surface === "second"
      ? describeSecondSurfaceGhost({ incidenceAngleDeg, glassThicknessMm: options?.mirrorGlassThicknessMm })
      : null;

  return {
    kind: "mirror",
    ...base,
    apertureMm,
    diskDiameterMm,
    diskLengthAlongPlaneMm: diskDiameterMm * elongation,
    elongation,
    acrossPlane,
    alongPlane,
    ghost,
    targetBlurFraction,
    maskForTargetBlurMm,
    throwForTargetBlurMm,
    warnings: [
      ...base.warnings,
      ...describeMirrorWarnings({
        instrument,
        bestMaskMm: bestMaskDiameterMm({ throwDistanceMm, wavelengthNm: context.wavelengthNm }),
        combinedFraction: base.combinedBlur.fractionOfDisk,
        targetBlurFraction,
        maskForTargetBlurMm,
        throwForTargetBlurMm,
        elongation,
        ghost,
      }),
    ],
  };
}

function describeAxisBlur({
  context,
  openingMm,
  throwDistanceMm,
  stretch,
}: {
  context: PlanContext;
  openingMm: number;
  throwDistanceMm: number;
  stretch: number;
}): MirrorAxisBlur {
  const sunDiameterArcsec = context.sun.diameterArcsec;
  const geometricArcsec = radiansToArcsec({ radians: openingMm / throwDistanceMm });
  const diffractionArcsec = diffractionBlurArcsec({
    apertureMm: openingMm,
    wavelengthNm: context.wavelengthNm,
  });
  const combinedArcsec = combineBlursArcsec({
    blursArcsec: [geometricArcsec, diffractionArcsec, context.seeingArcsec],
  });
  return {
    geometricBlur: describeBlur({ arcsec: geometricArcsec, sunDiameterArcsec }),
    diffractionBlur: describeBlur({ arcsec: diffractionArcsec, sunDiameterArcsec }),
    combinedBlur: describeBlur({ arcsec: combinedArcsec, sunDiameterArcsec }),
    blurOnCardMm: throwDistanceMm * Math.tan(combinedArcsec / ARCSEC_PER_RADIAN) * stretch,
  };
}

function describeMirrorWarnings({
  instrument,
  bestMaskMm,
  combinedFraction,
  targetBlurFraction,
  maskForTargetBlurMm,
  throwForTargetBlurMm,
  elongation,
  ghost,
}: {
  instrument: MirrorOptics;
  bestMaskMm: number;
  combinedFraction: number;
  targetBlurFraction: number;
  maskForTargetBlurMm: number | null;
  throwForTargetBlurMm: number | null;
  elongation: number;
  ghost: MirrorPlan["ghost"];
}): PlanWarning[] {
  const warnings: PlanWarning[] = [];
  const percent = (fraction: number) => `${(fraction * 100).toFixed(1)} %`;
  if (instrument.maskDiameterMm !== undefined && instrument.maskDiameterMm > instrument.mirrorSizeMm) {
    warnings.push({
      code: "mask-larger-than-mirror",
      message:
        "The mask opening is larger than the mirror, so the mirror's own size sets the blur. Check both sizes.",
    });
  }
  if (combinedFraction > targetBlurFraction) {
    const remedies = [
      maskForTargetBlurMm === null
        ? `mask the mirror to about ${bestMaskMm.toFixed(1)} mm (the sharpest this throw allows)`
        : `mask the mirror to about ${maskForTargetBlurMm.toFixed(1)} mm`,
      throwForTargetBlurMm === null
        ? null
        : `throw the image about ${(throwForTargetBlurMm / 1000).toFixed(1)} m`,
    ].filter((r): r is string => r !== null);
    warnings.push({
      code: "throw-too-short-for-aperture",
      message: `The blur is ${percent(combinedFraction)} of the disk, above the ${percent(targetBlurFraction)} aimed for. To sharpen it, ${remedies.join(" or ")}.`,
    });
  }
  if (instrument.incidenceAngleDeg >= GLANCING_INCIDENCE_DEG) {
    warnings.push({
      code: "glancing-incidence",
      message: `At ${Math.round(instrument.incidenceAngleDeg)}° the reflection is glancing: the disk and its blur are stretched ${elongation.toFixed(1)} times along one axis, the opening acts narrower that way, and any ghost grows brighter. Turn the mirror to face the Sun more squarely.`,
    });
  }
  if (ghost !== null) {
    warnings.push({
      code: "second-surface-ghost",
      message: `An ordinary glass mirror also reflects off the front of the glass: a faint second image (about ${Math.round(ghost.relativeBrightness * 100)} % as bright) sits ${ghost.offsetMm.toFixed(1)} mm beside the disk. A first-surface mirror avoids it.`,
    });
  }
  return warnings;
}

function requireIncidence({ incidenceAngleDeg }: { incidenceAngleDeg: number }): void {
  if (!Number.isFinite(incidenceAngleDeg) || incidenceAngleDeg < 0 || incidenceAngleDeg >= 90) {
    throw new RangeError(
      `incidenceAngleDeg must be from 0 up to (not including) 90, got ${incidenceAngleDeg}`,
    );
  }
}
