/**
 * Lengths for instrument profiles. Everything is stored and computed in
 * millimetres; the form shows each field in the unit observers actually use
 * for it and converts to millimetres before validation, so the schema and the
 * planner never see inches.
 */

export const UNIT_SYSTEMS = ["metric", "imperial"] as const;
export type UnitSystem = (typeof UNIT_SYSTEMS)[number];

export const LENGTH_UNITS = ["mm", "cm", "m", "in", "ft"] as const;
export type LengthUnit = (typeof LENGTH_UNITS)[number];

/** Exact by definition (international inch, 1959). */
const MM_PER_UNIT: Record<LengthUnit, number> = { mm: 1, cm: 10, m: 1000, in: 25.4, ft: 304.8 };

export function isUnitSystem(value: unknown): value is UnitSystem {
  return typeof value === "string" && (UNIT_SYSTEMS as readonly string[]).includes(value);
}

export function toMillimetres({ value, unit }: { value: number; unit: LengthUnit }): number {
  return value * MM_PER_UNIT[unit];
}

export function fromMillimetres({ valueMm, unit }: { valueMm: number; unit: LengthUnit }): number {
  return valueMm / MM_PER_UNIT[unit];
}

export function convertLength({
  value,
  from,
  to,
}: {
  value: number;
  from: LengthUnit;
  to: LengthUnit;
}): number {
  return fromMillimetres({ valueMm: toMillimetres({ value, unit: from }), unit: to });
}

/**
 * The unit a result reads best in: small things in mm or inches, a disk in
 * cm, a throw in metres or feet.
 */
export function chooseDisplayUnit({
  valueMm,
  unitSystem,
}: {
  valueMm: number;
  unitSystem: UnitSystem;
}): LengthUnit {
  const size = Math.abs(valueMm);
  if (unitSystem === "imperial") return size < MM_PER_UNIT.ft ? "in" : "ft";
  if (size < 100) return "mm";
  return size < 1000 ? "cm" : "m";
}

/**
 * "1.41 mm", "10.5 m", "0.236 in". Three significant figures by default:
 * the inputs (a hole drilled by hand, a throw paced out) are rarely better.
 */
export function formatLength({
  valueMm,
  unitSystem,
  unit,
  significantDigits = 3,
  locale = "en",
}: {
  valueMm: number;
  unitSystem: UnitSystem;
  unit?: LengthUnit;
  significantDigits?: number;
  locale?: string;
}): string {
  const shownUnit = unit ?? chooseDisplayUnit({ valueMm, unitSystem });
  const value = fromMillimetres({ valueMm, unit: shownUnit });
  const text = new Intl.NumberFormat(locale, { maximumSignificantDigits: significantDigits }).format(value);
  return `${text} ${shownUnit}`;
}

/**
 * Which unit each length field of the instrument form is typed in. Eyepiece
 * and camera-lens focal lengths stay in mm under imperial too, because that is
 * what is printed on them everywhere.
 */
export const LENGTH_FIELD_UNITS = {
  holeDiameterMm: { metric: "mm", imperial: "in" },
  boxLengthMm: { metric: "mm", imperial: "in" },
  mirrorSizeMm: { metric: "mm", imperial: "in" },
  maskDiameterMm: { metric: "mm", imperial: "in" },
  throwDistanceMm: { metric: "m", imperial: "ft" },
  apertureMm: { metric: "mm", imperial: "in" },
  focalLengthMm: { metric: "mm", imperial: "mm" },
  eyepieceFocalLengthMm: { metric: "mm", imperial: "mm" },
  eyepieceToScreenMm: { metric: "mm", imperial: "in" },
} as const satisfies Record<string, Record<UnitSystem, LengthUnit>>;

export type LengthField = keyof typeof LENGTH_FIELD_UNITS;

export function lengthFieldUnit({
  field,
  unitSystem,
}: {
  field: LengthField;
  unitSystem: UnitSystem;
}): LengthUnit {
  return LENGTH_FIELD_UNITS[field][unitSystem];
}

/**
 * Converts the length fields of raw form values (text or numbers, in each
 * field's display unit) to millimetres, ready for instrumentInputSchema.
 * Blank or non-numeric entries are passed through untouched so the schema
 * reports them with its own message on the right field.
 */
export function convertFormLengthsToMm<T extends Record<string, unknown>>({
  values,
  unitSystem,
}: {
  values: T;
  unitSystem: UnitSystem;
}): T {
  return mapLengthFields({
    values,
    convert: (value, field) => toMillimetres({ value, unit: lengthFieldUnit({ field, unitSystem }) }),
  });
}

/** The reverse, for filling the form from a stored profile. */
export function convertMmToFormLengths<T extends Record<string, unknown>>({
  values,
  unitSystem,
}: {
  values: T;
  unitSystem: UnitSystem;
}): T {
  return mapLengthFields({
    values,
    convert: (valueMm, field) => fromMillimetres({ valueMm, unit: lengthFieldUnit({ field, unitSystem }) }),
  });
}

function mapLengthFields<T extends Record<string, unknown>>({
  values,
  convert,
}: {
  values: T;
  convert: (value: number, field: LengthField) => number;
}): T {
  const out: Record<string, unknown> = { ...values };
  for (const field of Object.keys(LENGTH_FIELD_UNITS) as LengthField[]) {
    const number = parseLengthNumber(values[field]);
    if (number !== undefined) out[field] = convert(number, field);
  }
  return out as T;
}

function parseLengthNumber(raw: unknown): number | undefined {
  if (typeof raw === "number") return Number.isFinite(raw) ? raw : undefined;
  if (typeof raw !== "string" || raw.trim() === "") return undefined;
  const value = Number(raw.trim());
  return Number.isFinite(value) ? value : undefined;
}
