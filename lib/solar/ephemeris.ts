/**
 * Orientation of the Sun as seen from the Earth's centre: P, B0, L0, the
 * Carrington rotation number and the apparent semidiameter.
 *
 * Model: the IAU rotation elements of the Sun (Archinal et al. 2011, report
 * of the IAU Working Group on Cartographic Coordinates and Rotational
 * Elements): pole at RA 286.13°, Dec 63.87° (J2000), prime meridian
 * W = 84.176° + 14.1844°·d, d in days from J2000 at the Sun. The Sun's
 * position comes from astronomy-engine (VSOP87 for the Earth).
 *
 * Frames, kept consistent on purpose:
 * - Everything is computed in the J2000 mean equator (EQJ), where the IAU
 *   pole is fixed, so the pole never needs precessing.
 * - B0 and L0 use the geometric Sun→Earth vector, light-time corrected and
 *   without stellar aberration: the sub-observer point is the point that
 *   emitted the light we see, and aberration shifts the whole disk on the sky
 *   without changing which point that is. W is evaluated at t − light time to
 *   the nearest point of the surface (Thompson 2006; the same convention as
 *   sunpy's L0). Adding aberration would lower L0 by ~20.5″ (0.006°), as the
 *   Astronomical Almanac and Meeus do.
 * - P is a position angle on the observed sky, so it is measured at the
 *   apparent (aberrated) Sun direction from the true celestial pole of date
 *   (precession + nutation), carried back into EQJ by the inverse of
 *   astronomy-engine's EQJ→EQD rotation. Measuring from the J2000 pole instead
 *   would be off by up to 0.6° in 1900 and 2100.
 * - W is evaluated on the TT scale; TDB differs by < 2 ms (< 1e-6° of rotation).
 */
import { Body, GeoVector, RotateVector, Rotation_EQD_EQJ, Vector } from "astronomy-engine";

import { wrapDegrees360 } from "./angles";
import { J2000_JULIAN_DATE, toAstroTime } from "./time-scales";

export type SolarOrientation = {
  /** Position angle of the northern rotation axis, degrees, positive east of celestial north. */
  p: number;
  /** Heliographic latitude of the disk centre, degrees. */
  b0: number;
  /** Carrington longitude of the disk centre, degrees in [0, 360). */
  l0: number;
  /** Fractional Carrington rotation number; the fraction is 1 − L0/360. */
  carringtonRotation: number;
  /** Apparent semidiameter, arcseconds (959.63″ at 1 au). */
  semidiameterArcsec: number;
  /** Earth–Sun distance, au (light-time corrected). */
  distanceAu: number;
};

type Vec3 = { x: number; y: number; z: number };

const DEG = Math.PI / 180;
const ARCSEC = DEG / 3600;

const SOLAR_POLE_RA_DEG = 286.13;
const SOLAR_POLE_DEC_DEG = 63.87;
const PRIME_MERIDIAN_AT_J2000_DEG = 84.176;
const SIDEREAL_ROTATION_DEG_PER_DAY = 14.1844;

/** Classical (Auwers) value used by observers' almanacs; the IAU nominal radius gives 959.23″. */
export const SEMIDIAMETER_AT_1_AU_ARCSEC = 959.63;
/** IAU 2015 nominal solar radius in au, only for the light time to the nearest surface point. */
const SOLAR_RADIUS_AU = 695_700 / 149_597_870.7;
/** Light time for one astronomical unit, in days (IAU 2012 au, exact c). */
const LIGHT_DAYS_PER_AU = 149_597_870.7 / 299_792.458 / 86_400;

/** Start of Carrington rotation 1 (1853 Nov 9, JD 2398167.4 TT; Meeus 1998 ch. 29). */
const CARRINGTON_EPOCH_JD_TT = 2_398_167.4;
/** Mean synodic rotation seen from the Earth; used only to find the integer part. */
const MEAN_SYNODIC_PERIOD_DAYS = 27.2753;

const POLE: Vec3 = unitFromRaDec(SOLAR_POLE_RA_DEG * DEG, SOLAR_POLE_DEC_DEG * DEG);
/** Ascending node of the solar equator on the J2000 equator, where W is counted from. */
const NODE: Vec3 = { x: -Math.sin(SOLAR_POLE_RA_DEG * DEG), y: Math.cos(SOLAR_POLE_RA_DEG * DEG), z: 0 };
/** 90° ahead of the node in the sense of rotation, completing the solar-equator basis. */
const NODE_AHEAD: Vec3 = cross(POLE, NODE);

function unitFromRaDec(raRad: number, decRad: number): Vec3 {
  return {
    x: Math.cos(decRad) * Math.cos(raRad),
    y: Math.cos(decRad) * Math.sin(raRad),
    z: Math.sin(decRad),
  };
}

function dot(a: Vec3, b: Vec3): number {
  return a.x * b.x + a.y * b.y + a.z * b.z;
}

function cross(a: Vec3, b: Vec3): Vec3 {
  return { x: a.y * b.z - a.z * b.y, y: a.z * b.x - a.x * b.z, z: a.x * b.y - a.y * b.x };
}

function scale(a: Vec3, factor: number): Vec3 {
  return { x: a.x * factor, y: a.y * factor, z: a.z * factor };
}

function normalize(a: Vec3): Vec3 {
  return scale(a, 1 / Math.hypot(a.x, a.y, a.z));
}

/**
 * Whole rotations from a mean-period estimate, fraction from L0, and a wrap
 * correction when the two disagree across L0 = 0/360 (same scheme as sunpy's
 * carrington_rotation_number, so both number rotations identically).
 */
function computeCarringtonRotation({ julianDateTt, l0Deg }: { julianDateTt: number; l0Deg: number }): number {
  const estimate = (julianDateTt - CARRINGTON_EPOCH_JD_TT) / MEAN_SYNODIC_PERIOD_DAYS + 1;
  const whole = Math.floor(estimate);
  const estimatedFraction = estimate - whole;
  const fraction = 1 - l0Deg / 360;
  return whole + fraction + Math.round(estimatedFraction - fraction);
}

/** P, B0, L0, Carrington rotation and semidiameter for a UTC instant. */
export function solarOrientation(at: Date): SolarOrientation {
  const time = toAstroTime(at);

  const geometric = GeoVector(Body.Sun, time, false);
  const distanceAu = geometric.Length();
  const sunToEarth = scale(geometric, -1 / distanceAu);

  const b0Rad = Math.asin(dot(sunToEarth, POLE));

  const lightDays = (distanceAu - SOLAR_RADIUS_AU) * LIGHT_DAYS_PER_AU;
  const primeMeridianDeg =
    PRIME_MERIDIAN_AT_J2000_DEG + SIDEREAL_ROTATION_DEG_PER_DAY * (time.tt - lightDays);
  const earthAngleDeg = Math.atan2(dot(sunToEarth, NODE_AHEAD), dot(sunToEarth, NODE)) / DEG;
  const l0 = wrapDegrees360(earthAngleDeg - primeMeridianDeg);

  const apparent = GeoVector(Body.Sun, time, true);
  const lineOfSight = normalize(apparent);
  const poleOfDate = RotateVector(Rotation_EQD_EQJ(time), new Vector(0, 0, 1, time));
  const east = normalize(cross(poleOfDate, lineOfSight));
  const north = cross(lineOfSight, east);
  const p = Math.atan2(dot(POLE, east), dot(POLE, north)) / DEG;

  // Finite distance: sin S = R / D, with R set so that S = 959.63″ at 1 au.
  const semidiameterArcsec = Math.asin(Math.sin(SEMIDIAMETER_AT_1_AU_ARCSEC * ARCSEC) / distanceAu) / ARCSEC;

  return {
    p,
    b0: b0Rad / DEG,
    l0,
    carringtonRotation: computeCarringtonRotation({ julianDateTt: time.tt + J2000_JULIAN_DATE, l0Deg: l0 }),
    semidiameterArcsec,
    distanceAu,
  };
}
