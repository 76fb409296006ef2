/**
 * Geometry for the planner's drawing of a set-up: plain numbers in SVG pixel
 * space (y grows downwards), so it can be tested without a browser and drawn
 * by any component.
 *
 * Two views, each to scale with a scale bar:
 * - the side view: lengths along the light path on one scale; heights on a
 *   second, stated scale ("heights × 50"), because a 10 cm disk at the end of
 *   a 10 m throw would otherwise be a single pixel;
 * - the face view: the disk as it lands on the card (or sensor) with its
 *   blur, the smallest spot that will show, and the aperture, all on one
 *   scale, so their sizes can be compared by eye.
 * Filtered telescopes have no side view; their face view is the disk as it
 * looks in the eyepiece against an assumed field.
 */

import type { InstrumentOptics, ProjectionPlan } from "./types";
import { formatLength, type UnitSystem } from "./units";

export interface Point {
  x: number;
  y: number;
}

export interface ScaleBar {
  lengthMm: number;
  label: string;
}

export type StationKey =
  "hole" | "mirror" | "objective" | "prime-focus" | "eyepiece" | "card" | "lens" | "sensor";

export interface SideStation {
  key: StationKey;
  xMm: number;
  /** Half the height drawn, in mm (the aperture, or the disk on a screen). */
  halfHeightMm: number;
  xPx: number;
  halfHeightPx: number;
}

export interface IncidenceInset {
  center: Point;
  radiusPx: number;
  angleDeg: number;
  /** Where the sunlight comes from, the mirror's normal, the reflected beam, and the mirror's two ends. */
  sunFrom: Point;
  normalTo: Point;
  reflectedTo: Point;
  mirrorEnds: [Point, Point];
}

export interface SideView {
  widthPx: number;
  heightPx: number;
  axisYPx: number;
  pxPerMmAlong: number;
  /** Heights are drawn this many times larger than lengths; 1 is true shape. */
  heightExaggeration: number;
  stations: SideStation[];
  /** Closed polygons of the light between stations. */
  beams: Point[][];
  scaleBar: ScaleBar & { widthPx: number };
  incidence: IncidenceInset | null;
}

export interface FaceView {
  subject: "card" | "sensor" | "eyepiece";
  sizePx: number;
  center: Point;
  /** Disk radius along the plane of incidence (stretched for mirrors) and across it. */
  diskRadiusXPx: number;
  diskRadiusYPx: number;
  /** Width of the combined blur at the limb. */
  blurWidthPx: number;
  smallestSpotDiameterPx: number;
  /** The hole or mask at the card's scale, for comparison; null where there is none. */
  apertureDiameterPx: number | null;
  /** Second-surface mirror ghost, offset along the plane of incidence. */
  ghostOffsetPx: number | null;
  /** Eyepiece view only: the assumed field stop. */
  fieldRadiusPx: number | null;
  scaleBar: (ScaleBar & { widthPx: number }) | null;
}

export interface SetupDiagram {
  side: SideView | null;
  face: FaceView;
}

/** Apparent field of a common eyepiece (assumption, for the picture only). */
export const ASSUMED_EYEPIECE_FIELD_DEG = 50;

const SIDE_MARGIN_PX = 24;
/** Share of the side view's height the tallest station may fill. */
const SIDE_FILL = 0.7;
/** Share of the face view the disk's long axis fills. */
const FACE_FILL = 0.72;

export function computeSetupDiagram({
  instrument,
  plan,
  unitSystem,
  sideWidthPx = 640,
  sideHeightPx = 220,
  faceSizePx = 300,
}: {
  instrument: InstrumentOptics;
  plan: ProjectionPlan;
  unitSystem: UnitSystem;
  sideWidthPx?: number;
  sideHeightPx?: number;
  faceSizePx?: number;
}): SetupDiagram {
  const stations = describeStations({ instrument, plan });
  return {
    side:
      stations === null
        ? null
        : layoutSideView({
            stations,
            widthPx: sideWidthPx,
            heightPx: sideHeightPx,
            unitSystem,
            incidenceAngleDeg: instrument.kind === "mirror" ? instrument.incidenceAngleDeg : null,
          }),
    face: layoutFaceView({ instrument, plan, sizePx: faceSizePx, unitSystem }),
  };
}

/** Positions along the light path, in mm, or null for a kind with no drawable path. */
export function describeStations({
  instrument,
  plan,
}: {
  instrument: InstrumentOptics;
  plan: ProjectionPlan;
}): Array<Pick<SideStation, "key" | "xMm" | "halfHeightMm">> | null {
  if (instrument.kind === "pinhole" && plan.kind === "pinhole") {
    return [
      { key: "hole", xMm: 0, halfHeightMm: instrument.holeDiameterMm / 2 },
      { key: "card", xMm: instrument.boxLengthMm, halfHeightMm: plan.diskDiameterMm / 2 },
    ];
  }
  if (instrument.kind === "mirror" && plan.kind === "mirror") {
    return [
      { key: "mirror", xMm: 0, halfHeightMm: plan.apertureMm / 2 },
      { key: "card", xMm: instrument.throwDistanceMm, halfHeightMm: plan.diskDiameterMm / 2 },
    ];
  }
  if (instrument.kind === "eyepiece-projection" && plan.kind === "eyepiece-projection") {
    const { apertureMm, focalLengthMm, eyepieceFocalLengthMm, eyepieceToScreenMm } = instrument;
    // Thin-lens eyepiece as in eyepiece-projection.ts: the prime image sits u in front of it.
    const primeToEyepieceMm =
      (eyepieceToScreenMm * eyepieceFocalLengthMm) / (eyepieceToScreenMm - eyepieceFocalLengthMm);
    const eyepieceXMm = focalLengthMm + primeToEyepieceMm;
    return [
      { key: "objective", xMm: 0, halfHeightMm: apertureMm / 2 },
      { key: "prime-focus", xMm: focalLengthMm, halfHeightMm: plan.primeFocusDiskDiameterMm / 2 },
      {
        key: "eyepiece",
        xMm: eyepieceXMm,
        // The cone that converged on the prime image has opened again by the eyepiece.
        halfHeightMm:
          (apertureMm * primeToEyepieceMm) / focalLengthMm / 2 + plan.primeFocusDiskDiameterMm / 2,
      },
      { key: "card", xMm: eyepieceXMm + eyepieceToScreenMm, halfHeightMm: plan.diskDiameterMm / 2 },
    ];
  }
  if (instrument.kind === "camera" && plan.kind === "camera") {
    return [
      {
        key: "lens",
        xMm: 0,
        // Without an aperture the lens is drawn as wide as the focal length over 5: a guess, only for the picture.
        halfHeightMm: (instrument.apertureMm ?? instrument.focalLengthMm / 5) / 2,
      },
      { key: "sensor", xMm: instrument.focalLengthMm, halfHeightMm: plan.diskDiameterOnSensorMm / 2 },
    ];
  }
  return null;
}

export function layoutSideView({
  stations,
  widthPx,
  heightPx,
  unitSystem,
  incidenceAngleDeg = null,
}: {
  stations: Array<Pick<SideStation, "key" | "xMm" | "halfHeightMm">>;
  widthPx: number;
  heightPx: number;
  unitSystem: UnitSystem;
  incidenceAngleDeg?: number | null;
}): SideView {
  const lengthMm = Math.max(...stations.map((s) => s.xMm));
  const tallestMm = Math.max(...stations.map((s) => s.halfHeightMm));
  const pxPerMmAlong = (widthPx - 2 * SIDE_MARGIN_PX) / lengthMm;
  const fitExaggeration = (heightPx * SIDE_FILL) / 2 / tallestMm / pxPerMmAlong;
  // A round factor the reader can trust; never squash heights below true shape unless they do not fit.
  const heightExaggeration =
    fitExaggeration >= 1 ? roundDownToNice({ value: fitExaggeration }) : fitExaggeration;
  const pxPerMmUp = pxPerMmAlong * heightExaggeration;
  const axisYPx = heightPx / 2;
  const placed: SideStation[] = stations.map((s) => ({
    ...s,
    xPx: SIDE_MARGIN_PX + s.xMm * pxPerMmAlong,
    halfHeightPx: s.halfHeightMm * pxPerMmUp,
  }));
  const beams: Point[][] = [];
  for (let i = 0; i + 1 < placed.length; i += 1) {
    const from = placed[i]!;
    const to = placed[i + 1]!;
    beams.push([
      { x: from.xPx, y: axisYPx - from.halfHeightPx },
      { x: to.xPx, y: axisYPx - to.halfHeightPx },
      { x: to.xPx, y: axisYPx + to.halfHeightPx },
      { x: from.xPx, y: axisYPx + from.halfHeightPx },
    ]);
  }
  const bar = chooseScaleBar({ maxLengthMm: lengthMm / 3, unitSystem });
  return {
    widthPx,
    heightPx,
    axisYPx,
    pxPerMmAlong,
    heightExaggeration,
    stations: placed,
    beams,
    scaleBar: { ...bar, widthPx: bar.lengthMm * pxPerMmAlong },
    incidence:
      incidenceAngleDeg === null
        ? null
        : describeIncidenceInset({
            angleDeg: incidenceAngleDeg,
            center: { x: SIDE_MARGIN_PX + 36, y: 44 },
            radiusPx: 34,
          }),
  };
}

/**
 * The mirror seen edge-on, drawn with true angles (its size is symbolic).
 * The reflected beam leaves towards +x, the card; the normal bisects it and
 * the sunlight, so the Sun sits 2i from the beam on the same side.
 */
export function describeIncidenceInset({
  angleDeg,
  center,
  radiusPx,
}: {
  angleDeg: number;
  center: Point;
  radiusPx: number;
}): IncidenceInset {
  const rad = (angleDeg * Math.PI) / 180;
  const at = (angle: number, length: number): Point => ({
    x: center.x + length * Math.cos(angle),
    y: center.y - length * Math.sin(angle),
  });
  const half = radiusPx * 0.6;
  return {
    center,
    radiusPx,
    angleDeg,
    sunFrom: at(2 * rad, radiusPx),
    normalTo: at(rad, radiusPx * 0.8),
    reflectedTo: at(0, radiusPx),
    mirrorEnds: [at(rad + Math.PI / 2, half), at(rad - Math.PI / 2, half)],
  };
}

export function layoutFaceView({
  instrument,
  plan,
  sizePx,
  unitSystem,
}: {
  instrument: InstrumentOptics;
  plan: ProjectionPlan;
  sizePx: number;
  unitSystem: UnitSystem;
}): FaceView {
  const center = { x: sizePx / 2, y: sizePx / 2 };
  const fraction = (arcsec: number) => arcsec / plan.sunDiameterArcsec;

  if (plan.kind === "filtered-telescope") {
    const fieldRadiusPx = (sizePx * FACE_FILL) / 2;
    const diskRadiusPx = (fieldRadiusPx * plan.apparentDiskDiameterDeg) / ASSUMED_EYEPIECE_FIELD_DEG;
    return {
      subject: "eyepiece",
      sizePx,
      center,
      diskRadiusXPx: diskRadiusPx,
      diskRadiusYPx: diskRadiusPx,
      blurWidthPx: 2 * diskRadiusPx * plan.combinedBlur.fractionOfDisk,
      smallestSpotDiameterPx: 2 * diskRadiusPx * fraction(plan.smallestSpot.arcsec),
      apertureDiameterPx: null,
      ghostOffsetPx: null,
      fieldRadiusPx,
      scaleBar: null,
    };
  }

  const diskMm = plan.kind === "camera" ? plan.diskDiameterOnSensorMm : plan.diskDiameterMm;
  const elongation = plan.kind === "mirror" ? plan.elongation : 1;
  const ghostMm = plan.kind === "mirror" ? (plan.ghost?.offsetMm ?? 0) : 0;
  const apertureMm =
    instrument.kind === "pinhole"
      ? instrument.holeDiameterMm
      : plan.kind === "mirror"
        ? plan.apertureMm
        : null;
  const longestMm = diskMm * elongation + ghostMm;
  const pxPerMm = (sizePx * FACE_FILL) / longestMm;
  // For mirrors, the plan's combined blur is the worse of its two axes.
  const blurMm = diskMm * plan.combinedBlur.fractionOfDisk;
  const bar = chooseScaleBar({ maxLengthMm: longestMm / 2, unitSystem });
  return {
    subject: plan.kind === "camera" ? "sensor" : "card",
    sizePx,
    center,
    diskRadiusXPx: (diskMm * elongation * pxPerMm) / 2,
    diskRadiusYPx: (diskMm * pxPerMm) / 2,
    blurWidthPx: blurMm * pxPerMm,
    smallestSpotDiameterPx: diskMm * fraction(plan.smallestSpot.arcsec) * pxPerMm,
    apertureDiameterPx: apertureMm === null ? null : apertureMm * pxPerMm,
    ghostOffsetPx: ghostMm > 0 ? ghostMm * pxPerMm : null,
    fieldRadiusPx: null,
    scaleBar: { ...bar, widthPx: bar.lengthMm * pxPerMm },
  };
}

const METRIC_STEPS_MM = [1, 2, 5];
/** Common fractions of an inch below an inch, whole inches below a foot, then feet. */
const IMPERIAL_STEPS: ScaleBar[] = [
  ...(
    [
      [1 / 16, "1/16 in"],
      [1 / 8, "1/8 in"],
      [1 / 4, "1/4 in"],
      [1 / 2, "1/2 in"],
      [1, "1 in"],
      [2, "2 in"],
      [3, "3 in"],
      [6, "6 in"],
    ] as const
  ).map(([inches, label]) => ({ lengthMm: inches * 25.4, label })),
  ...[1, 2, 3, 5, 10, 20, 30, 50, 100, 200, 500].map((feet) => ({
    lengthMm: feet * 304.8,
    label: `${feet} ft`,
  })),
];

/** The longest round length (1, 2 or 5 × a power of ten; or a round inch or foot) not over `maxLengthMm`. */
export function chooseScaleBar({
  maxLengthMm,
  unitSystem,
}: {
  maxLengthMm: number;
  unitSystem: UnitSystem;
}): ScaleBar {
  if (!(maxLengthMm > 0) || !Number.isFinite(maxLengthMm)) {
    throw new RangeError(`maxLengthMm must be a positive number, got ${maxLengthMm}`);
  }
  if (unitSystem === "imperial") {
    // Below 1/16 in (a sensor view), fall back to the smallest step rather than invent a finer fraction.
    return (
      IMPERIAL_STEPS.filter((step) => step.lengthMm <= maxLengthMm * (1 + 1e-9)).at(-1) ?? IMPERIAL_STEPS[0]!
    );
  }
  const lengthMm = roundDownToNice({ value: maxLengthMm, steps: METRIC_STEPS_MM });
  return { lengthMm, label: formatLength({ valueMm: lengthMm, unitSystem, significantDigits: 2 }) };
}

/** The largest 1, 2 or 5 × 10ⁿ (or other steps) not above `value`. */
export function roundDownToNice({ value, steps = [1, 2, 5] }: { value: number; steps?: number[] }): number {
  const power = 10 ** Math.floor(Math.log10(value));
  let best = power * steps[0]!;
  for (const step of steps) if (power * step <= value * (1 + 1e-9)) best = power * step;
  return best;
}
