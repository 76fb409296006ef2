/**
 * Disk position ↔ heliographic coordinates (W. T. Thompson 2006, "Coordinate
 * systems for solar image data", A&A 449, 791).
 *
 * Disk points are `{ x, y }` in units of the apparent solar radius on the sky,
 * origin at the disk centre, x toward celestial west and y toward celestial
 * north: the disk as seen on the sky, north up and west to the right. A
 * projection on card is mirror-reversed and must be flipped by the caller. `lon` is the Stonyhurst
 * longitude, i.e. the central meridian distance, positive west; `rho` is the
 * heliocentric angle between the point and the sub-observer point.
 *
 * The observer is at a finite distance, so a point at a fraction r of the
 * apparent radius S lies at ρ = asin(sin(rS)/sin S) − rS, and the limb
 * (r = 1) is at ρ = 90° − S, not 90°: taking ρ = asin(r) would misplace
 * points near the limb by up to a quarter of a degree.
 */
import { wrapDegrees180, wrapDegrees360 } from "./angles";
import { type SolarOrientation, solarOrientation } from "./ephemeris";

export type DiskPoint = { x: number; y: number };

export type HeliographicPosition = {
  /** Heliographic latitude, degrees. */
  lat: number;
  /** Central meridian distance (Stonyhurst longitude), degrees in (−180, 180], positive west. */
  lon: number;
  /** Carrington longitude, degrees in [0, 360). */
  carringtonLon: number;
  /** Heliocentric angle from the disk centre, degrees. */
  rho: number;
  /** cos ρ, the foreshortening factor for areas. */
  mu: number;
  /** Hemisphere of the point; a point exactly on the equator counts as northern. */
  hemisphere: "N" | "S";
};

export type HeliographicInput = { lat: number; lon: number } | { lat: number; carringtonLon: number };

export type DiskProjection = DiskPoint & {
  /** Heliocentric angle, degrees. */
  rho: number;
  mu: number;
  /**
   * cos ρ − sin S: positive on the visible hemisphere, zero on the limb,
   * negative behind the Sun. Continuous, so callers can clip curves at the limb.
   */
  limbMargin: number;
};

/** A Date (orientation computed here) or an orientation already computed for the instant. */
export type OrientationSource = Date | SolarOrientation;

const DEG = Math.PI / 180;
const ARCSEC = DEG / 3600;

/** Trigonometry of one orientation, shared by every point converted for that instant. */
type Frame = {
  source: Pick<SolarOrientation, "p" | "b0" | "l0" | "semidiameterArcsec">;
  sinP: number;
  cosP: number;
  sinB0: number;
  cosB0: number;
  semidiameterRad: number;
  sinS: number;
  /** Observer distance in solar radii, 1 / sin S. */
  distanceRadii: number;
  l0: number;
};

// Callers convert thousands of points per orientation object; caching the
// trigonometry per object (not per instant) keeps each call to a few flops.
const frameCache = new WeakMap<SolarOrientation, Frame>();

export function resolveOrientation(at: OrientationSource): SolarOrientation {
  return at instanceof Date ? solarOrientation(at) : at;
}

function getFrame(orientation: SolarOrientation): Frame {
  const cached = frameCache.get(orientation);
  const { p, b0, l0, semidiameterArcsec } = orientation;
  // An orientation object may be edited in place (say, a hand-corrected P), so check before reuse.
  if (
    cached &&
    cached.source.p === p &&
    cached.source.b0 === b0 &&
    cached.source.l0 === l0 &&
    cached.source.semidiameterArcsec === semidiameterArcsec
  ) {
    return cached;
  }
  const semidiameterRad = semidiameterArcsec * ARCSEC;
  const sinS = Math.sin(semidiameterRad);
  const frame: Frame = {
    source: { p, b0, l0, semidiameterArcsec },
    sinP: Math.sin(p * DEG),
    cosP: Math.cos(p * DEG),
    sinB0: Math.sin(b0 * DEG),
    cosB0: Math.cos(b0 * DEG),
    semidiameterRad,
    sinS,
    distanceRadii: 1 / sinS,
    l0,
  };
  frameCache.set(orientation, frame);
  return frame;
}

function clampUnit(value: number): number {
  return value > 1 ? 1 : value < -1 ? -1 : value;
}

/**
 * Heliographic coordinates of a disk point, or null off the disk (r > 1).
 * Pass a precomputed orientation when converting many points for one instant.
 */
export function diskToHeliographic(point: DiskPoint, at: OrientationSource): HeliographicPosition | null {
  const r = Math.hypot(point.x, point.y);
  if (!(r <= 1)) return null; // also rejects NaN
  const orientation = resolveOrientation(at);
  const frame = getFrame(orientation);

  const angleRad = r * frame.semidiameterRad;
  const rhoRad = Math.asin(clampUnit(Math.sin(angleRad) / frame.sinS)) - angleRad;
  const sinRho = Math.sin(rhoRad);
  const cosRho = Math.cos(rhoRad);

  // Heliocentric-Cartesian unit vector (Thompson 2006 §2.2): X solar west,
  // Y solar north (in the plane of the sky), Z toward the observer.
  let hx = 0;
  let hy = 0;
  if (r > 0) {
    const solarWest = point.x * frame.cosP + point.y * frame.sinP;
    const solarNorth = -point.x * frame.sinP + point.y * frame.cosP;
    hx = (sinRho * solarWest) / r;
    hy = (sinRho * solarNorth) / r;
  }
  const hz = cosRho;

  const latRad = Math.asin(clampUnit(hy * frame.cosB0 + hz * frame.sinB0));
  const lonRad = Math.atan2(hx, hz * frame.cosB0 - hy * frame.sinB0);
  const lat = latRad / DEG;
  const lon = wrapDegrees180(lonRad / DEG);
  return {
    lat,
    lon,
    carringtonLon: wrapDegrees360(lon + frame.l0),
    rho: rhoRad / DEG,
    mu: cosRho,
    hemisphere: lat >= 0 ? "N" : "S",
  };
}

/**
 * Projects a heliographic point onto the disk whether or not it is visible
 * (a hidden point lands where it would be seen through the Sun). Use
 * `limbMargin` to tell the two apart; {@link heliographicToDisk} does.
 */
export function projectHeliographicToDisk(
  position: HeliographicInput,
  at: OrientationSource,
): DiskProjection {
  const orientation = resolveOrientation(at);
  const frame = getFrame(orientation);
  const lonDeg = "lon" in position ? position.lon : position.carringtonLon - frame.l0;
  const latRad = position.lat * DEG;
  const lonRad = lonDeg * DEG;
  const cosLat = Math.cos(latRad);
  const sinLat = Math.sin(latRad);
  const cosLon = Math.cos(lonRad);

  const hx = cosLat * Math.sin(lonRad);
  const hy = sinLat * frame.cosB0 - cosLat * cosLon * frame.sinB0;
  const hz = clampUnit(sinLat * frame.sinB0 + cosLat * cosLon * frame.cosB0);

  const sinRho = Math.hypot(hx, hy);
  // Angle at the observer between disk centre and the point: the exact
  // inverse of ρ = asin(sin θ / sin S) − θ.
  const angleRad = Math.atan2(sinRho, frame.distanceRadii - hz);
  const r = angleRad / frame.semidiameterRad;
  let x = 0;
  let y = 0;
  if (sinRho > 0) {
    const solarWest = (r * hx) / sinRho;
    const solarNorth = (r * hy) / sinRho;
    x = solarWest * frame.cosP - solarNorth * frame.sinP;
    y = solarWest * frame.sinP + solarNorth * frame.cosP;
  }
  // atan2 rather than acos(hz): acos loses half its digits near the disk centre.
  return { x, y, rho: Math.atan2(sinRho, hz) / DEG, mu: hz, limbMargin: hz - frame.sinS };
}

/**
 * Disk position of a heliographic point, or null when the point is on the far
 * side (beyond the limb as seen from the Earth). Give either `lon` (central
 * meridian distance) or `carringtonLon`.
 */
export function heliographicToDisk(
  position: HeliographicInput,
  at: OrientationSource,
): { x: number; y: number; rho: number; mu: number } | null {
  const projection = projectHeliographicToDisk(position, at);
  if (!(projection.limbMargin >= 0)) return null; // also rejects NaN input
  return { x: projection.x, y: projection.y, rho: projection.rho, mu: projection.mu };
}
