/** Angle helpers shared by the solar modules. All angles in degrees. */

const DEG = Math.PI / 180;

/** Wraps an angle into [0, 360). */
export function wrapDegrees360(angleDeg: number): number {
  const wrapped = angleDeg % 360;
  const positive = wrapped < 0 ? wrapped + 360 : wrapped;
  // -1e-15 % 360 + 360 rounds to exactly 360; keep the half-open range.
  return positive >= 360 ? 0 : positive;
}

/** Wraps an angle into (−180, 180], e.g. a central meridian distance. */
export function wrapDegrees180(angleDeg: number): number {
  const wrapped = wrapDegrees360(angleDeg);
  return wrapped > 180 ? wrapped - 360 : wrapped;
}

/**
 * Great-circle distance between two points given as latitude/longitude,
 * degrees. Uses atan2 of the chord components (Vincenty's special case), which
 * stays accurate for the sub-arcsecond differences the tests compare.
 */
export function computeAngularSeparationDeg(
  a: { lat: number; lon: number },
  b: { lat: number; lon: number },
): number {
  const lat1 = a.lat * DEG;
  const lat2 = b.lat * DEG;
  const dLon = (b.lon - a.lon) * DEG;
  const y = Math.hypot(
    Math.cos(lat2) * Math.sin(dLon),
    Math.cos(lat1) * Math.sin(lat2) - Math.sin(lat1) * Math.cos(lat2) * Math.cos(dLon),
  );
  const x = Math.sin(lat1) * Math.sin(lat2) + Math.cos(lat1) * Math.cos(lat2) * Math.cos(dLon);
  return Math.atan2(y, x) / DEG;
}
