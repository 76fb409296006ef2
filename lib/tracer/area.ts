/**
 * Areas of spots and groups in millionths of the solar hemisphere (MSH).
 *
 * The observer draws an ellipse around a spot or group; its area on the
 * drawing, over the disk's area, is the projected area as a fraction of the
 * disk. A patch at heliocentric angle ρ is seen foreshortened by cos ρ, so
 * its true area on the sphere is the projected area / cos ρ. With the disk
 * radius R (the Sun's radius) and the hemisphere's 2πR²:
 *
 *   A[MSH] = 10⁶ · A_drawn / (2π R² cos ρ)
 *
 * (common practice: the convention of the Greenwich photoheliographic
 * results, restated in PRODUCT.md; no single published source). The
 * correction is taken at the ellipse's centre, so it is an approximation
 * for large groups close to the limb, where observers rarely measure areas.
 */

import { diskToHeliographic, type OrientationSource } from "@/lib/solar/heliographic";

import { documentToSky, type SkyFrame } from "./orientation";

export type TracedEllipse = { cx: number; cy: number; rx: number; ry: number; rotationDeg: number };

/** Beyond this heliocentric angle (μ < 0.1) the correction is too uncertain to report an area. */
export const MAX_AREA_RHO_DEG = 84;

/** Projected area of an ellipse over the whole disk's area: π·a·b / (π·R²). */
export function computeDiskFraction({
  ellipse,
  diskRadius,
}: {
  ellipse: TracedEllipse;
  diskRadius: number;
}): number {
  return (ellipse.rx * ellipse.ry) / (diskRadius * diskRadius);
}

/** Area in MSH for a projected fraction of the disk at foreshortening μ = cos ρ. */
export function computeAreaMsh({ diskFraction, mu }: { diskFraction: number; mu: number }): number {
  // diskFraction · πR² is the projected area; over 2πR² that is diskFraction / 2 of the hemisphere.
  return (1e6 * diskFraction) / (2 * mu);
}

export type EllipseArea =
  | { ok: true; areaMsh: number; projectedMsh: number; rhoDeg: number; mu: number }
  | { ok: false; message: string };

/** Corrected area of an ellipse drawn on a tracing, measured at the ellipse's centre. */
export function measureEllipseArea({
  ellipse,
  frame,
  at,
}: {
  ellipse: TracedEllipse;
  frame: SkyFrame;
  at: OrientationSource;
}): EllipseArea {
  const sky = documentToSky({ point: { x: ellipse.cx, y: ellipse.cy }, frame });
  const position = diskToHeliographic(sky, at);
  if (!position) return { ok: false, message: "The area's centre lies outside the disk." };
  if (position.rho > MAX_AREA_RHO_DEG) {
    return {
      ok: false,
      message: `Too close to the limb (ρ = ${position.rho.toFixed(0)}°) to correct the area for foreshortening.`,
    };
  }
  const diskFraction = computeDiskFraction({ ellipse, diskRadius: frame.radius });
  return {
    ok: true,
    areaMsh: computeAreaMsh({ diskFraction, mu: position.mu }),
    projectedMsh: computeAreaMsh({ diskFraction, mu: 1 }),
    rhoDeg: position.rho,
    mu: position.mu,
  };
}
