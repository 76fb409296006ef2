/**
 * How big the Sun looks from Earth, for the projection planner.
 *
 * This is deliberately a fallback: the precise semidiameter will come from the
 * ephemeris (lib/solar/ephemeris.ts). Callers that have it pass
 * `semidiameterArcsec` and every function here uses it unchanged, so the
 * planner never disagrees with the ephemeris shown on the same page.
 */

export const ARCSEC_PER_RADIAN = (180 * 3600) / Math.PI;

/**
 * Solar semidiameter at 1 au. The almanacs' long-standing value (A. Auwers,
 * 1891); PRODUCT.md uses it too, so the planner and the brief agree.
 */
export const MEAN_SEMIDIAMETER_ARCSEC = 959.63;

/** IAU 2015 Resolution B3 nominal solar radius. */
export const SOLAR_RADIUS_KM = 695_700;

/**
 * Kilometres on the Sun per arcsecond seen from 1 au, taken as the solar
 * radius over the semidiameter: 695,700 km / 959.63″ ≈ 724.97 km, the
 * "1″ ≈ 725 km" observers quote. (1 au × 1″ in radians gives 725.27 km; the
 * 0.04 % gap is because 959.63″ was fixed for a 696,000 km radius. Neither
 * matters at the precision of a projected image.)
 */
export const KM_PER_ARCSEC_AT_1AU = SOLAR_RADIUS_KM / MEAN_SEMIDIAMETER_ARCSEC;

const MS_PER_DAY = 86_400_000;
const JULIAN_DATE_AT_UNIX_EPOCH = 2_440_587.5;
const J2000_JULIAN_DATE = 2_451_545.0;
const DEG = Math.PI / 180;

/** Apparent diameter of the Sun seen from `distanceAu`, in arcseconds. */
export function apparentDiameterArcsec({ distanceAu }: { distanceAu: number }): number {
  requirePositive({ value: distanceAu, name: "distanceAu" });
  return (2 * MEAN_SEMIDIAMETER_ARCSEC) / distanceAu;
}

/**
 * Earth–Sun distance in au from the low-precision solar formulae of the
 * Astronomical Almanac (also published by the US Naval Observatory as
 * "Approximate solar coordinates"):
 *   g = 357.529° + 0.98560028° × n,  n = days from J2000.0
 *   R = 1.00014 − 0.01671 cos g − 0.00014 cos 2g
 * Quoted (from memory) as good to a few 1e-4 au within two centuries of 2000;
 * tests/unit/optics compare it with astronomy-engine. An error of 3e-4 au is
 * 0.6″ in the diameter, far below anything a projected image shows. Time
 * scale differences (UT vs TT, about a minute) are ignored for the same reason.
 */
export function earthSunDistanceAu({ at }: { at: Date }): number {
  const ms = at.getTime();
  if (!Number.isFinite(ms)) throw new RangeError("earthSunDistanceAu: `at` is not a valid date");
  const daysFromJ2000 = ms / MS_PER_DAY + JULIAN_DATE_AT_UNIX_EPOCH - J2000_JULIAN_DATE;
  const meanAnomalyRad = (357.529 + 0.98560028 * daysFromJ2000) * DEG;
  return 1.00014 - 0.01671 * Math.cos(meanAnomalyRad) - 0.00014 * Math.cos(2 * meanAnomalyRad);
}

export interface SunForPlanning {
  semidiameterArcsec: number;
  diameterArcsec: number;
  distanceAu: number;
  kmPerArcsec: number;
}

/**
 * The Sun's size for a plan. Precedence: an explicit `semidiameterArcsec`
 * (from the ephemeris), else the date's approximate distance, else 1 au.
 * With an override, the distance is recovered from it so that the
 * kilometre scale stays consistent with the size actually used.
 */
export function describeSunForPlanning({
  at,
  semidiameterArcsec,
}: { at?: Date; semidiameterArcsec?: number } = {}): SunForPlanning {
  let distanceAu: number;
  let semidiameter: number;
  if (semidiameterArcsec !== undefined) {
    requirePositive({ value: semidiameterArcsec, name: "semidiameterArcsec" });
    semidiameter = semidiameterArcsec;
    distanceAu = MEAN_SEMIDIAMETER_ARCSEC / semidiameterArcsec;
  } else {
    distanceAu = at ? earthSunDistanceAu({ at }) : 1;
    semidiameter = MEAN_SEMIDIAMETER_ARCSEC / distanceAu;
  }
  return {
    semidiameterArcsec: semidiameter,
    diameterArcsec: 2 * semidiameter,
    distanceAu,
    kmPerArcsec: kmPerArcsec({ distanceAu }),
  };
}

/** Apparent solar diameter on a date, in arcseconds; see describeSunForPlanning. */
export function apparentDiameterOnDateArcsec({
  at,
  semidiameterArcsec,
}: {
  at: Date;
  semidiameterArcsec?: number;
}): number {
  return describeSunForPlanning({ at, semidiameterArcsec }).diameterArcsec;
}

/**
 * Kilometres on the Sun per arcsecond seen from `distanceAu`: a fixed angle
 * spans more of the Sun the farther away we are.
 */
export function kmPerArcsec({ distanceAu }: { distanceAu: number }): number {
  requirePositive({ value: distanceAu, name: "distanceAu" });
  return KM_PER_ARCSEC_AT_1AU * distanceAu;
}

function requirePositive({ value, name }: { value: number; name: string }): void {
  if (!Number.isFinite(value) || value <= 0)
    throw new RangeError(`${name} must be a positive number, got ${value}`);
}
