/**
 * Suggested groups: spots whose heliographic positions lie close together
 * are linked, and the chains of linked spots are offered to the observer as
 * groups (single-linkage clustering on great-circle distance). The observer
 * accepts or corrects them; nothing is grouped without being asked.
 *
 * The default link distance is a rule of thumb (from memory, common
 * practice rather than a published rule): spots of one group seldom sit
 * more than about 5° of heliographic arc from their nearest neighbour in the
 * group, while neighbouring groups are usually further apart. Large bipolar
 * groups are kept together by their intermediate spots.
 */

import { computeAngularSeparationDeg } from "@/lib/solar/angles";

export const DEFAULT_LINK_DISTANCE_DEG = 5;

export type PlacedSpot = { id: string; lat: number; lon: number };

/** Clusters of spot ids, largest first, each cluster in the order the spots were given. */
export function suggestGroups({
  spots,
  linkDistanceDeg = DEFAULT_LINK_DISTANCE_DEG,
}: {
  spots: PlacedSpot[];
  linkDistanceDeg?: number;
}): string[][] {
  // Union–find: n ≤ 1500, so the n² pair scan (about a million separations) stays well under a frame budget.
  const parent = spots.map((_, i) => i);
  const find = (i: number): number => {
    let root = i;
    while (parent[root] !== root) root = parent[root]!;
    while (parent[i] !== root) {
      const next = parent[i]!;
      parent[i] = root;
      i = next;
    }
    return root;
  };
  for (let i = 0; i < spots.length; i += 1) {
    for (let j = i + 1; j < spots.length; j += 1) {
      const a = spots[i]!;
      const b = spots[j]!;
      // Cheap latitude test first: the arc is at least the latitude difference.
      if (Math.abs(a.lat - b.lat) > linkDistanceDeg) continue;
      if (computeAngularSeparationDeg(a, b) <= linkDistanceDeg) {
        const ra = find(i);
        const rb = find(j);
        if (ra !== rb) parent[Math.max(ra, rb)] = Math.min(ra, rb);
      }
    }
  }
  const clusters = new Map<number, string[]>();
  spots.forEach((spot, i) => {
    const root = find(i);
    const list = clusters.get(root) ?? [];
    list.push(spot.id);
    clusters.set(root, list);
  });
  return [...clusters.values()].sort((a, b) => b.length - a.length);
}

const DEG = Math.PI / 180;

/**
 * Centre of a set of heliographic positions: the mean of their unit vectors
 * on the sphere, so a group straddling a meridian or the equator averages
 * correctly. Longitudes are central meridian distances.
 */
export function computeCentroid({ positions }: { positions: Array<{ lat: number; lon: number }> }): {
  lat: number;
  lon: number;
} | null {
  if (positions.length === 0) return null;
  let x = 0;
  let y = 0;
  let z = 0;
  for (const { lat, lon } of positions) {
    const cosLat = Math.cos(lat * DEG);
    x += cosLat * Math.cos(lon * DEG);
    y += cosLat * Math.sin(lon * DEG);
    z += Math.sin(lat * DEG);
  }
  const horizontal = Math.hypot(x, y);
  return { lat: Math.atan2(z, horizontal) / DEG, lon: Math.atan2(y, x) / DEG };
}
