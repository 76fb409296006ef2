/**
 * Picking spots on the tracing: by pointer (nearest spot under it) and by
 * lasso (spots inside a free-hand outline). Plain geometry, so the tracer
 * needs no hit canvas: with hundreds of spots, skipping Konva's hit graph
 * keeps every redraw to the visible drawing only.
 */

import type { PlanePoint } from "./orientation";

export type PickableSpot = {
  id: string;
  x: number;
  y: number;
  umbraRadius: number;
  penumbraRadius: number | null;
};

/** The spot under a point: the nearest whose drawn size (or the tolerance, if larger) covers it. */
export function findSpotAt({
  spots,
  point,
  toleranceUnits,
}: {
  spots: readonly PickableSpot[];
  point: PlanePoint;
  /** Minimum pick radius in document units, so small spots stay easy to hit with a finger. */
  toleranceUnits: number;
}): string | null {
  let best: string | null = null;
  let bestDistance = Infinity;
  for (const spot of spots) {
    const reach = Math.max(spot.penumbraRadius ?? spot.umbraRadius, toleranceUnits);
    const distance = Math.hypot(spot.x - point.x, spot.y - point.y);
    if (distance <= reach && distance < bestDistance) {
      best = spot.id;
      bestDistance = distance;
    }
  }
  return best;
}

/** Even–odd rule: whether a point lies inside a closed polygon (last point joins the first). */
export function isInsidePolygon({
  point,
  polygon,
}: {
  point: PlanePoint;
  polygon: readonly PlanePoint[];
}): boolean {
  let inside = false;
  for (let i = 0, j = polygon.length - 1; i < polygon.length; j = i, i += 1) {
    const a = polygon[i]!;
    const b = polygon[j]!;
    if (a.y > point.y !== b.y > point.y && point.x < ((b.x - a.x) * (point.y - a.y)) / (b.y - a.y) + a.x)
      inside = !inside;
  }
  return inside;
}

/** Ids of the spots whose centres lie inside a lasso outline. */
export function selectInsideLasso({
  spots,
  lasso,
}: {
  spots: readonly PickableSpot[];
  lasso: readonly PlanePoint[];
}): string[] {
  if (lasso.length < 3) return [];
  return spots.filter((spot) => isInsidePolygon({ point: spot, polygon: lasso })).map((spot) => spot.id);
}
