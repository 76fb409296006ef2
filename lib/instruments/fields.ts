/**
 * What the instrument form and the planner ask for, kind by kind. The names
 * are the schema's (lib/validation/instrument.ts); this file only adds the
 * words and units the observer sees.
 */

import { INSTRUMENT_KINDS, type InstrumentKind } from "@/lib/optics/types";
import { lengthFieldUnit, LENGTH_FIELD_UNITS, type LengthField, type UnitSystem } from "@/lib/optics/units";

export { INSTRUMENT_KINDS };

export const INSTRUMENT_KIND_LABELS: Record<InstrumentKind, string> = {
  pinhole: "Pinhole box",
  mirror: "Mirror projection",
  "eyepiece-projection": "Telescope, eyepiece projection",
  camera: "Camera behind a solar filter",
  "filtered-telescope": "Telescope with a solar filter",
};

export const INSTRUMENT_KIND_HINTS: Record<InstrumentKind, string> = {
  pinhole: "A small hole in foil at one end of a box or tube, the disk on a card at the other.",
  mirror: "A small flat mirror, often masked to a round opening, throws the disk onto a shaded wall.",
  "eyepiece-projection": "The telescope's eyepiece projects the disk onto a card held behind it.",
  camera: "A camera or telescope with a certified full-aperture filter; the disk lands on the sensor.",
  "filtered-telescope": "Looking through a telescope whose front is covered by a certified solar filter.",
};

/**
 * Kinds where optics point at the Sun and concentrate its light or heat, or
 * (mirror) send a beam across a room: the safety notice is emphasised.
 */
export function describeSafetyEmphasis({
  kind,
}: {
  kind: InstrumentKind | string;
}): "mirror" | "telescope-projection" | "filtered-optics" | null {
  if (kind === "mirror") return "mirror";
  if (kind === "eyepiece-projection") return "telescope-projection";
  if (kind === "camera" || kind === "filtered-telescope") return "filtered-optics";
  return null;
}

export type FieldSpec =
  | { name: LengthField; input: "length"; label: string; hint?: string; optional?: boolean }
  | {
      name: "incidenceAngleDeg" | "pixelSizeUm" | "magnification";
      input: "number";
      unit: string;
      label: string;
      hint?: string;
    }
  | { name: "filter"; input: "text"; label: string; hint?: string }
  | { name: "surface"; input: "surface"; label: string; hint?: string };

export const SURFACE_OPTIONS = [
  { value: "first", label: "First-surface (coating on the front)" },
  { value: "second", label: "Ordinary glass mirror (second-surface)" },
] as const;

export const KIND_FIELDS: Record<InstrumentKind, FieldSpec[]> = {
  pinhole: [
    {
      name: "holeDiameterMm",
      input: "length",
      label: "Hole diameter",
      hint: "Measure it under a magnifier.",
    },
    { name: "boxLengthMm", input: "length", label: "Box length", hint: "From the hole to the card." },
  ],
  mirror: [
    { name: "mirrorSizeMm", input: "length", label: "Mirror size", hint: "Its largest dimension." },
    {
      name: "maskDiameterMm",
      input: "length",
      label: "Mask opening (optional)",
      hint: "The round hole in the card over the mirror; leave blank if unmasked.",
      optional: true,
    },
    {
      name: "throwDistanceMm",
      input: "length",
      label: "Throw distance",
      hint: "From the mirror to the card.",
    },
    {
      name: "incidenceAngleDeg",
      input: "number",
      unit: "°",
      label: "Angle of incidence",
      hint: "Between the sunlight and the mirror's normal; 0° faces the Sun squarely.",
    },
    { name: "surface", input: "surface", label: "Mirror surface" },
  ],
  "eyepiece-projection": [
    {
      name: "apertureMm",
      input: "length",
      label: "Aperture",
      hint: "The clear opening in use (after any mask).",
    },
    { name: "focalLengthMm", input: "length", label: "Telescope focal length" },
    {
      name: "eyepieceFocalLengthMm",
      input: "length",
      label: "Eyepiece focal length",
      hint: "Printed on it.",
    },
    {
      name: "eyepieceToScreenMm",
      input: "length",
      label: "Eyepiece to screen",
      hint: "From the eyepiece to the card.",
    },
  ],
  camera: [
    { name: "focalLengthMm", input: "length", label: "Focal length" },
    {
      name: "pixelSizeUm",
      input: "number",
      unit: "µm",
      label: "Pixel size",
      hint: "From the sensor's data sheet.",
    },
    {
      name: "filter",
      input: "text",
      label: "Solar filter",
      hint: "The certified filter over the front, e.g. white-light film.",
    },
    { name: "apertureMm", input: "length", label: "Aperture (optional)", optional: true },
  ],
  "filtered-telescope": [
    { name: "apertureMm", input: "length", label: "Aperture" },
    { name: "magnification", input: "number", unit: "×", label: "Magnification" },
    {
      name: "filter",
      input: "text",
      label: "Solar filter",
      hint: "The certified filter over the front, e.g. full-aperture glass.",
    },
  ],
};

/** The unit shown beside a field's box. */
export function describeFieldUnit({
  field,
  unitSystem,
}: {
  field: FieldSpec;
  unitSystem: UnitSystem;
}): string {
  if (field.input === "length") return lengthFieldUnit({ field: field.name, unitSystem });
  if (field.input === "number") return field.unit;
  return "";
}

export function isLengthField(name: string): name is LengthField {
  return Object.hasOwn(LENGTH_FIELD_UNITS, name);
}

/** Every field name any kind uses, for clearing the form. */
export const ALL_FIELD_NAMES = [
  ...new Set(Object.values(KIND_FIELDS).flatMap((fields) => fields.map((f) => f.name))),
];

/**
 * Starting values for "try a set-up", as typed in each unit system: round
 * numbers in the observer's own units rather than converted odd ones. The
 * mirror is the trade's ¼-inch mask at 35 ft (about 6 mm at 10.5 m).
 */
export const EXAMPLE_SETUPS: Record<UnitSystem, Record<InstrumentKind, Record<string, string>>> = {
  metric: {
    pinhole: { holeDiameterMm: "1", boxLengthMm: "1000" },
    mirror: {
      mirrorSizeMm: "50",
      maskDiameterMm: "6",
      throwDistanceMm: "10.5",
      incidenceAngleDeg: "20",
      surface: "first",
    },
    "eyepiece-projection": {
      apertureMm: "80",
      focalLengthMm: "900",
      eyepieceFocalLengthMm: "25",
      eyepieceToScreenMm: "300",
    },
    camera: { focalLengthMm: "600", pixelSizeUm: "3.76", filter: "white-light film over the front" },
    "filtered-telescope": { apertureMm: "90", magnification: "50", filter: "full-aperture film" },
  },
  imperial: {
    pinhole: { holeDiameterMm: "0.04", boxLengthMm: "40" },
    mirror: {
      mirrorSizeMm: "2",
      maskDiameterMm: "0.25",
      throwDistanceMm: "35",
      incidenceAngleDeg: "20",
      surface: "first",
    },
    "eyepiece-projection": {
      apertureMm: "3.1",
      focalLengthMm: "900",
      eyepieceFocalLengthMm: "25",
      eyepieceToScreenMm: "12",
    },
    camera: { focalLengthMm: "600", pixelSizeUm: "3.76", filter: "white-light film over the front" },
    "filtered-telescope": { apertureMm: "3.5", magnification: "50", filter: "full-aperture film" },
  },
};

/** Fills the boxes of `kind` that are still empty with its example values. */
export function fillWithExample({
  values,
  kind,
  unitSystem,
}: {
  values: Record<string, string>;
  kind: InstrumentKind;
  unitSystem: UnitSystem;
}): Record<string, string> {
  const out: Record<string, string> = { ...values, kind };
  for (const [name, example] of Object.entries(EXAMPLE_SETUPS[unitSystem][kind])) {
    if (!out[name]?.trim()) out[name] = example;
  }
  return out;
}
