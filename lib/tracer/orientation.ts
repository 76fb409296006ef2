/**
 * From the traced image to the sky, and back.
 *
 * The tracing is drawn in document units with y pointing down (like the
 * screen and every image file). The solar modules want disk points in units
 * of the disk radius with x toward celestial west and y toward celestial north
 * (lib/solar/heliographic.ts). Between the two sit the fitted disk (centre,
 * radius) and the observer's orientation, given one of two ways:
 *
 * - a north mark: a point in the direction of celestial north from the centre;
 * - a drift line: the direction in which the image drifts with the telescope
 *   drive off. The sky turns from east to west, so the drift points to
 *   celestial west (common practice for orienting solar drawings).
 *
 * With north known, west is a quarter turn clockwise on an image that shows
 * the disk as seen on the sky (north up, west right, as in heliographic.ts),
 * and a quarter turn anticlockwise on a mirror-reversed image (a projection
 * seen from the side the light comes from, a star diagonal, a mirror):
 * the "mirrored image" tick. Both ways give the same pair of axes, so a
 * tracing oriented either way measures the same positions.
 */

export type PlanePoint = { x: number; y: number };

export type TracedDisk = { cx: number; cy: number; r: number };

export type TracedOrientation =
  | { mode: "north"; point: PlanePoint; mirrored: boolean }
  | { mode: "drift"; from: PlanePoint; to: PlanePoint; mirrored: boolean };

/** The disk and the directions of celestial north and west in document units (unit vectors, y down). */
export type SkyFrame = {
  cx: number;
  cy: number;
  radius: number;
  north: PlanePoint;
  west: PlanePoint;
  mirrored: boolean;
};

export type SkyFrameResult = { ok: true; frame: SkyFrame } | { ok: false; message: string };

/** A quarter turn clockwise as seen on a y-down screen: up (0, −1) becomes right (1, 0). */
function turnClockwise({ x, y }: PlanePoint): PlanePoint {
  return { x: -y, y: x };
}

/** A quarter turn anticlockwise as seen on a y-down screen: right (1, 0) becomes up (0, −1). */
function turnAnticlockwise({ x, y }: PlanePoint): PlanePoint {
  return { x: y, y: -x };
}

function unit(v: PlanePoint): PlanePoint | null {
  const length = Math.hypot(v.x, v.y);
  return length > 0 && Number.isFinite(length) ? { x: v.x / length, y: v.y / length } : null;
}

/** The sky axes of a tracing, or the reason they cannot be found yet. */
export function resolveSkyFrame({
  disk,
  orientation,
}: {
  disk: TracedDisk | null;
  orientation: TracedOrientation | null;
}): SkyFrameResult {
  if (!disk || !(disk.r > 0)) {
    return {
      ok: false,
      message: "Fit the disk first: drag a circle over it, or click three or more points on its limb.",
    };
  }
  if (!orientation) {
    return {
      ok: false,
      message:
        "Orient the disk: mark celestial north, or draw the east–west drift line, so positions can be measured.",
    };
  }
  const base = { cx: disk.cx, cy: disk.cy, radius: disk.r, mirrored: orientation.mirrored };
  if (orientation.mode === "north") {
    const north = unit({ x: orientation.point.x - disk.cx, y: orientation.point.y - disk.cy });
    if (!north)
      return {
        ok: false,
        message: "The north mark sits on the disk centre; place it toward celestial north.",
      };
    const west = orientation.mirrored ? turnAnticlockwise(north) : turnClockwise(north);
    return { ok: true, frame: { ...base, north, west } };
  }
  const west = unit({ x: orientation.to.x - orientation.from.x, y: orientation.to.y - orientation.from.y });
  if (!west)
    return { ok: false, message: "The drift line has no length; drag it in the direction the image drifts." };
  const north = orientation.mirrored ? turnClockwise(west) : turnAnticlockwise(west);
  return { ok: true, frame: { ...base, north, west } };
}

/** A document point as a disk point: units of the disk radius, x celestial west, y celestial north. */
export function documentToSky({ point, frame }: { point: PlanePoint; frame: SkyFrame }): PlanePoint {
  const dx = point.x - frame.cx;
  const dy = point.y - frame.cy;
  return {
    x: (dx * frame.west.x + dy * frame.west.y) / frame.radius,
    y: (dx * frame.north.x + dy * frame.north.y) / frame.radius,
  };
}

/** The inverse of documentToSky: where a disk point lands on the tracing. */
export function skyToDocument({ point, frame }: { point: PlanePoint; frame: SkyFrame }): PlanePoint {
  return {
    x: frame.cx + frame.radius * (point.x * frame.west.x + point.y * frame.north.x),
    y: frame.cy + frame.radius * (point.x * frame.west.y + point.y * frame.north.y),
  };
}

/** Distance from the disk centre in disk radii (1 on the limb). */
export function distanceFromCentreInRadii({ point, disk }: { point: PlanePoint; disk: TracedDisk }): number {
  return Math.hypot(point.x - disk.cx, point.y - disk.cy) / disk.r;
}
