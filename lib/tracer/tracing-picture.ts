import { resolveSkyFrame, type PlanePoint } from "./orientation";

import type { TracingDocument } from "@/lib/validation/tracing";

/**
 * A read-only picture of a saved tracing, drawn from its vector form alone:
 * what a reviewer needs to see when no PNG was saved with it (imports, the
 * demo, tracings saved before the tracer sent one). Everything is in the
 * tracing's own document units; the caller scales it with an SVG viewBox.
 */
export type TracingPicture = {
  viewBox: { x: number; y: number; width: number; height: number };
  disk: { cx: number; cy: number; r: number } | null;
  /** Sky directions just outside the limb, once the disk is oriented. */
  compass: Array<{ label: "N" | "E" | "S" | "W"; x: number; y: number }>;
  spots: Array<{ x: number; y: number; umbra: number; penumbra: number | null; grouped: boolean }>;
  /** Measured areas (spots' and groups'), as the tracer drew them: rotated clockwise on the drawing. */
  areas: Array<{ cx: number; cy: number; rx: number; ry: number; rotationDeg: number; of: "spot" | "group" }>;
  /** Where each group's number goes: just above its spots (or its area). */
  groupLabels: Array<{ number: number; x: number; y: number }>;
  /** A size for text and lines that reads the same whatever the drawing's scale. */
  textSize: number;
  lineWidth: number;
  mirrored: boolean;
};

/** How far outside the limb the compass letters sit, in disk radii. */
const COMPASS_OFFSET = 1.1;
/** Room around the disk for the compass letters, in disk radii. */
const MARGIN = 1.22;

export function pictureOfTracing(document: TracingDocument): TracingPicture {
  const { disk, orientation } = document;
  const scale = disk ? disk.r : Math.max(document.canvas.width, document.canvas.height) / 2;
  const textSize = scale * 0.075;
  const viewBox = disk
    ? {
        x: disk.cx - disk.r * MARGIN,
        y: disk.cy - disk.r * MARGIN,
        width: 2 * disk.r * MARGIN,
        height: 2 * disk.r * MARGIN,
      }
    : { x: 0, y: 0, width: document.canvas.width, height: document.canvas.height };

  const compass: TracingPicture["compass"] = [];
  const frame = resolveSkyFrame({ disk, orientation });
  if (frame.ok) {
    const { cx, cy, radius, north, west } = frame.frame;
    const at = (direction: PlanePoint, sign: 1 | -1) => ({
      x: cx + sign * direction.x * radius * COMPASS_OFFSET,
      y: cy + sign * direction.y * radius * COMPASS_OFFSET,
    });
    compass.push({ label: "N", ...at(north, 1) });
    compass.push({ label: "S", ...at(north, -1) });
    compass.push({ label: "W", ...at(west, 1) });
    compass.push({ label: "E", ...at(west, -1) });
  }

  const spots = document.spots.map((spot) => ({
    x: spot.x,
    y: spot.y,
    umbra: spot.umbraRadius,
    penumbra: spot.penumbraRadius,
    grouped: spot.groupId !== null,
  }));

  const groupLabels: TracingPicture["groupLabels"] = [];
  for (const group of document.groups) {
    const members = document.spots.filter((spot) => spot.groupId === group.id);
    if (members.length > 0) {
      let x = 0;
      let top = Infinity;
      for (const spot of members) {
        x += spot.x;
        top = Math.min(top, spot.y - (spot.penumbraRadius ?? spot.umbraRadius));
      }
      groupLabels.push({ number: group.number, x: x / members.length, y: top - textSize * 0.4 });
    } else if (group.area) {
      groupLabels.push({
        number: group.number,
        x: group.area.cx,
        y: group.area.cy - Math.max(group.area.rx, group.area.ry) - textSize * 0.4,
      });
    }
  }

  const areas: TracingPicture["areas"] = [
    ...document.spots.flatMap((spot) => (spot.area ? [{ ...spot.area, of: "spot" as const }] : [])),
    ...document.groups.flatMap((group) => (group.area ? [{ ...group.area, of: "group" as const }] : [])),
  ];

  return {
    viewBox,
    areas,
    disk: disk ? { cx: disk.cx, cy: disk.cy, r: disk.r } : null,
    compass,
    spots,
    groupLabels,
    textSize,
    lineWidth: scale * 0.006,
    mirrored: orientation?.mirrored ?? false,
  };
}
