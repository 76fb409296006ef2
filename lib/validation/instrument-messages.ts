/**
 * instrumentInputSchema speaks millimetres, because that is what it receives.
 * The form, though, shows each length in the observer's own unit (inches,
 * feet, metres), so a message such as "Enter the throw distance (mm)" or
 * "the size is in millimetres" would send them the wrong way. This rewrites
 * the unit words of a length field's message into the unit of its box, and
 * turns the millimetre values quoted in it into that unit too.
 */

import { formatLength, lengthFieldUnit, type LengthUnit, type UnitSystem } from "@/lib/optics/units";

import { isLengthField } from "../instruments/fields";

const UNIT_WORDS: Record<LengthUnit, string> = {
  mm: "millimetres",
  cm: "centimetres",
  m: "metres",
  in: "inches",
  ft: "feet",
};

/**
 * Fields whose messages quote their own kind of length. The eyepiece
 * message quotes the eyepiece focal length, which stays in mm everywhere,
 * so its numbers are left alone.
 */
const QUOTES_OWN_UNIT = new Set(["maskDiameterMm"]);

export function localiseInstrumentMessage({
  field,
  message,
  unitSystem,
}: {
  field: string;
  message: string;
  unitSystem: UnitSystem;
}): string {
  if (!isLengthField(field)) return message;
  const unit = lengthFieldUnit({ field, unitSystem });
  let text = message.replace("(mm)", `(${unit})`).replace(/is in millimetres/g, `is in ${UNIT_WORDS[unit]}`);
  const quotedUnit = QUOTES_OWN_UNIT.has(field) ? unit : "mm";
  // "(152.39999999999998 mm)" → "(6 in)"; also tidies the float noise of a conversion in metric.
  text = text.replace(/\((-?\d+(?:\.\d+)?(?:e-?\d+)?) mm\)/g, (_, number: string) => {
    return `(${formatLength({ valueMm: Number(number), unitSystem, unit: quotedUnit, significantDigits: 4 })})`;
  });
  return text;
}

/** Issues from zod or from the API, localised and keyed by field (first message wins). */
export function collectInstrumentErrors({
  issues,
  unitSystem,
}: {
  issues: ReadonlyArray<{ path: ReadonlyArray<PropertyKey> | string; message: string }>;
  unitSystem: UnitSystem;
}): Record<string, string> {
  const out: Record<string, string> = {};
  for (const issue of issues) {
    const key = (typeof issue.path === "string" ? issue.path : issue.path.map(String).join(".")) || "_form";
    out[key] ??= localiseInstrumentMessage({ field: key, message: issue.message, unitSystem });
  }
  return out;
}
