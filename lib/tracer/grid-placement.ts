/**
 * The heliographic grid (lib/solar/grid.ts, in disk-radius units on the sky)
 * placed on a tracing: flat [x0, y0, x1, y1, …] polylines in document units,
 * ready for a canvas. Recomputed only when the disk or its orientation changes.
 */

import type { HeliographicGrid } from "@/lib/solar/grid";
import type { DiskPoint } from "@/lib/solar/heliographic";

import { skyToDocument, type PlanePoint, type SkyFrame } from "./orientation";

export type PlacedGrid = {
  /** Parallels and meridians every 10° (or the grid's spacing), except the equator and central meridian. */
  lines: number[][];
  equator: number[][];
  centralMeridian: number[][];
  northPole: PlanePoint | null;
  southPole: PlanePoint | null;
};

function flatten(points: DiskPoint[], frame: SkyFrame): number[] {
  const out: number[] = [];
  for (const p of points) {
    const q = skyToDocument({ point: p, frame });
    out.push(q.x, q.y);
  }
  return out;
}

export function placeGridOnTracing({ grid, frame }: { grid: HeliographicGrid; frame: SkyFrame }): PlacedGrid {
  return {
    lines: [...grid.parallels, ...grid.meridians].flatMap((l) => l.segments.map((s) => flatten(s, frame))),
    equator: grid.equator.segments.map((s) => flatten(s, frame)),
    centralMeridian: grid.centralMeridian.segments.map((s) => flatten(s, frame)),
    northPole: grid.northPole ? skyToDocument({ point: grid.northPole, frame }) : null,
    southPole: grid.southPole ? skyToDocument({ point: grid.southPole, frame }) : null,
  };
}
