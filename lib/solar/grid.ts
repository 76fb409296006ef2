/**
 * Heliographic grid for drawing over a disk: parallels and meridians every
 * `spacingDeg`, the equator, the central meridian, the visible pole(s) and
 * the limb, in disk-radius units (x west, y north, origin at disk centre; see
 * heliographic.ts). A canvas with y pointing down must flip y.
 *
 * Only the visible parts are returned. Curves are sampled along the sphere
 * and each hidden/visible transition is refined by bisection on the limb
 * margin, so every clipped end lies on the limb (r = 1) rather than one
 * sample short of it.
 */
import { wrapDegrees180, wrapDegrees360 } from "./angles";
import type { SolarOrientation } from "./ephemeris";
import {
  type DiskPoint,
  type OrientationSource,
  projectHeliographicToDisk,
  resolveOrientation,
} from "./heliographic";

export type GridLine = {
  /** Visible pieces, each an open polyline; a fully visible parallel is closed (first point = last). */
  segments: DiskPoint[][];
};

export type HeliographicGrid = {
  orientation: SolarOrientation;
  /** Closed circle r = 1 (first point = last). */
  limb: DiskPoint[];
  equator: GridLine;
  centralMeridian: GridLine;
  /** Parallels at every multiple of the spacing except 0°, those with a visible part only. */
  parallels: Array<GridLine & { latDeg: number }>;
  /**
   * Meridians at every multiple of the spacing in the chosen longitude
   * system, from pole to pole, those with a visible part only. `lonDeg` is
   * the central meridian distance at this instant; `carringtonLonDeg` the
   * Carrington longitude. In the "central-meridian" system the 0° meridian is
   * left out because `centralMeridian` draws it.
   */
  meridians: Array<GridLine & { lonDeg: number; carringtonLonDeg: number }>;
  northPole: DiskPoint | null;
  southPole: DiskPoint | null;
};

export type GridOptions = {
  at: OrientationSource;
  /** Spacing of parallels and meridians, degrees; must divide 90. */
  spacingDeg?: number;
  /** Stonyhurst lines (relative to the central meridian) or Carrington lines (fixed on the Sun). */
  longitudeSystem?: "central-meridian" | "carrington";
  /** Sampling step along each line, degrees of arc on the sphere. */
  sampleStepDeg?: number;
  /** Points on the limb circle. */
  limbPointCount?: number;
};

type LinePoint = { lat: number; lon: number };

/** Halves the sampling interval 32 times (1° → ~1e-9°): far below a pixel on any screen. */
const BISECTION_STEPS = 32;

/** Finds where a line crosses the limb between a visible and a hidden parameter value. */
function findLimbCrossing({
  pointAt,
  orientation,
  visibleParam,
  hiddenParam,
}: {
  pointAt: (param: number) => LinePoint;
  orientation: SolarOrientation;
  visibleParam: number;
  hiddenParam: number;
}): DiskPoint {
  let inside = visibleParam;
  let outside = hiddenParam;
  for (let step = 0; step < BISECTION_STEPS; step += 1) {
    const middle = (inside + outside) / 2;
    if (projectHeliographicToDisk(pointAt(middle), orientation).limbMargin >= 0) inside = middle;
    else outside = middle;
  }
  const { x, y } = projectHeliographicToDisk(pointAt(inside), orientation);
  // Put the end exactly on the limb: the bisection leaves r a hair under 1.
  const r = Math.hypot(x, y);
  return r > 0 ? { x: x / r, y: y / r } : { x, y };
}

/**
 * Samples a line over [start, end] and keeps its visible runs. For parallels
 * (lon −180…180) and meridians (lat −90…90) the visible part is one
 * contiguous run, because cos ρ along them peaks at lon 0 and at one latitude
 * respectively; the run never straddles the ±180° seam unless the whole
 * parallel is visible, in which case it is returned closed.
 */
function traceVisibleSegments({
  pointAt,
  start,
  end,
  sampleCount,
  orientation,
}: {
  pointAt: (param: number) => LinePoint;
  start: number;
  end: number;
  sampleCount: number;
  orientation: SolarOrientation;
}): DiskPoint[][] {
  const segments: DiskPoint[][] = [];
  let current: DiskPoint[] | null = null;
  let previousParam = start;
  let previousVisible = false;

  for (let index = 0; index <= sampleCount; index += 1) {
    const param = start + ((end - start) * index) / sampleCount;
    const projection = projectHeliographicToDisk(pointAt(param), orientation);
    const visible = projection.limbMargin >= 0;
    if (index > 0 && visible !== previousVisible) {
      const crossing = findLimbCrossing({
        pointAt,
        orientation,
        visibleParam: visible ? param : previousParam,
        hiddenParam: visible ? previousParam : param,
      });
      if (visible) {
        current = [crossing];
      } else if (current) {
        current.push(crossing);
        segments.push(current);
        current = null;
      }
    }
    if (visible) {
      current ??= [];
      current.push({ x: projection.x, y: projection.y });
    }
    previousParam = param;
    previousVisible = visible;
  }
  if (current) segments.push(current);
  return segments.filter((segment) => segment.length >= 2);
}

/** lon −180 and +180 differ by rounding only; make a fully visible parallel exactly closed. */
function closeFullCircle(segment: DiskPoint[]): DiskPoint[] {
  const first = segment[0];
  const last = segment[segment.length - 1];
  if (first && last && Math.hypot(first.x - last.x, first.y - last.y) < 1e-9) {
    segment[segment.length - 1] = { ...first };
  }
  return segment;
}

function assertSpacing(spacingDeg: number): void {
  if (!(spacingDeg > 0) || !Number.isInteger(90 / spacingDeg)) {
    throw new RangeError(`spacingDeg must divide 90, got ${spacingDeg}`);
  }
}

/** Grid polylines for one instant, visible parts only, in disk-radius units. */
export function computeHeliographicGrid({
  at,
  spacingDeg = 10,
  longitudeSystem = "central-meridian",
  sampleStepDeg = 1,
  limbPointCount = 360,
}: GridOptions): HeliographicGrid {
  assertSpacing(spacingDeg);
  if (!(sampleStepDeg > 0)) throw new RangeError(`sampleStepDeg must be positive, got ${sampleStepDeg}`);
  const orientation = resolveOrientation(at);
  const meridianSamples = Math.ceil(180 / sampleStepDeg);

  const traceParallel = (latDeg: number): DiskPoint[][] =>
    traceVisibleSegments({
      pointAt: (lon) => ({ lat: latDeg, lon }),
      start: -180,
      end: 180,
      // A parallel is shorter than a great circle by cos(lat), so fewer samples keep the arc
      // step. The count is even so lon 0, where a parallel is most visible, is always sampled:
      // even a sliver of a parallel near the limb is then found.
      sampleCount: 2 * Math.max(12, Math.ceil((180 * Math.cos((latDeg * Math.PI) / 180)) / sampleStepDeg)),
      orientation,
    }).map(closeFullCircle);
  const traceMeridian = (lonDeg: number): DiskPoint[][] =>
    traceVisibleSegments({
      pointAt: (lat) => ({ lat, lon: lonDeg }),
      start: -90,
      end: 90,
      sampleCount: meridianSamples,
      orientation,
    });

  const parallels: HeliographicGrid["parallels"] = [];
  for (let latDeg = -90 + spacingDeg; latDeg < 90; latDeg += spacingDeg) {
    if (latDeg === 0) continue;
    const segments = traceParallel(latDeg);
    if (segments.length > 0) parallels.push({ latDeg, segments });
  }

  const meridians: HeliographicGrid["meridians"] = [];
  for (let k = 0; k * spacingDeg < 360; k += 1) {
    const systemLonDeg = k * spacingDeg;
    if (longitudeSystem === "central-meridian" && systemLonDeg === 0) continue;
    const lonDeg =
      longitudeSystem === "carrington"
        ? wrapDegrees180(systemLonDeg - orientation.l0)
        : wrapDegrees180(systemLonDeg);
    const segments = traceMeridian(lonDeg);
    if (segments.length === 0) continue;
    meridians.push({ lonDeg, carringtonLonDeg: wrapDegrees360(lonDeg + orientation.l0), segments });
  }

  const limb: DiskPoint[] = [];
  for (let index = 0; index <= limbPointCount; index += 1) {
    const angle = (2 * Math.PI * (index % limbPointCount)) / limbPointCount;
    limb.push({ x: Math.cos(angle), y: Math.sin(angle) });
  }

  const poleAt = (lat: number): DiskPoint | null => {
    const projection = projectHeliographicToDisk({ lat, lon: 0 }, orientation);
    return projection.limbMargin >= 0 ? { x: projection.x, y: projection.y } : null;
  };

  return {
    orientation,
    limb,
    equator: { segments: traceParallel(0) },
    centralMeridian: { segments: traceMeridian(0) },
    parallels,
    meridians: meridians.sort((a, b) => a.lonDeg - b.lonDeg),
    northPole: poleAt(90),
    southPole: poleAt(-90),
  };
}
