/**
 * An instrument profile as stored (name, kind, notes, params in mm) and as
 * the planner and the form need it. Stored params are read back through the
 * same instrumentInputSchema that let them in, so a row written before a rule
 * was tightened (or by hand) never reaches the planner unchecked.
 */

import type { InstrumentKind, InstrumentOptics } from "@/lib/optics/types";

import { KIND_FIELDS } from "./fields";
import { convertFormLengthsToMm, convertMmToFormLengths, type UnitSystem } from "@/lib/optics/units";
import { instrumentInputSchema, type InstrumentInput } from "@/lib/validation/instrument";

/** Keys of the schema's output that are not optics. */
const PROFILE_KEYS = new Set(["kind", "name", "notes", "unitSystem"]);

export type InstrumentParams = Record<string, number | string>;

export interface InstrumentRecord {
  name: string;
  kind: InstrumentKind;
  notes: string | null;
  params: InstrumentParams;
}

/** The validated input split into the columns of the instruments table. */
export function splitInstrumentInput({ input }: { input: InstrumentInput }): InstrumentRecord {
  return { name: input.name, kind: input.kind, notes: input.notes ?? null, params: pickParams(input) };
}

/**
 * The planner's view of a stored row, or null when its params do not pass
 * the schema (an instrument made before its details were asked for).
 */
export function readInstrumentOptics({
  kind,
  params,
}: {
  kind: string;
  params: unknown;
}): InstrumentOptics | null {
  if (typeof params !== "object" || params === null || Array.isArray(params)) return null;
  // The name is not stored in params; any non-empty text satisfies the schema.
  const parsed = instrumentInputSchema.safeParse({ ...params, kind, name: "stored profile" });
  if (!parsed.success) return null;
  return { kind: parsed.data.kind, ...pickParams(parsed.data) } as InstrumentOptics;
}

/**
 * Text for every box of the instrument form, in the observer's units. Six
 * significant figures hide the float noise of a round trip through mm
 * (0.25 in → 6.35 mm → 0.25 in) while keeping anything anyone typed.
 */
export function toInstrumentFormValues({
  record,
  unitSystem,
}: {
  record: { name: string; kind: string; notes: string | null; params: unknown };
  unitSystem: UnitSystem;
}): Record<string, string> {
  const params =
    typeof record.params === "object" && record.params !== null
      ? (record.params as Record<string, unknown>)
      : {};
  const converted = convertMmToFormLengths({ values: params, unitSystem });
  const out: Record<string, string> = { kind: record.kind, name: record.name, notes: record.notes ?? "" };
  for (const [key, value] of Object.entries(converted)) {
    if (typeof value === "number" && Number.isFinite(value)) out[key] = formatFormNumber(value);
    else if (typeof value === "string") out[key] = value;
  }
  return out;
}

/**
 * What the form sends to instrumentInputSchema: the chosen kind's boxes only
 * (boxes of a kind the observer switched away from are left out), with the
 * lengths converted to mm and the unit system they were typed in.
 */
export function buildInstrumentDraft({
  values,
  unitSystem,
}: {
  values: Record<string, string>;
  unitSystem: UnitSystem;
}): Record<string, unknown> {
  const kind = values.kind ?? "";
  const draft: Record<string, unknown> = { kind, name: values.name, notes: values.notes, unitSystem };
  for (const field of KIND_FIELDS[kind as InstrumentKind] ?? []) draft[field.name] = values[field.name] ?? "";
  return convertFormLengthsToMm({ values: draft, unitSystem });
}

/**
 * The form's text re-expressed in other units when the observer switches
 * systems mid-entry: "4" (in) becomes "101.6" (mm). Boxes that do not hold a
 * number are left as typed, for the schema to report.
 */
export function convertFormValues({
  values,
  from,
  to,
}: {
  values: Record<string, string>;
  from: UnitSystem;
  to: UnitSystem;
}): Record<string, string> {
  if (from === to) return values;
  const inMm = convertFormLengthsToMm({ values: values as Record<string, unknown>, unitSystem: from });
  const converted = convertMmToFormLengths({ values: inMm, unitSystem: to });
  const out: Record<string, string> = {};
  for (const [key, value] of Object.entries(converted)) {
    out[key] = typeof value === "number" ? formatFormNumber(value) : String(value ?? "");
  }
  return out;
}

export function formatFormNumber(value: number): string {
  return String(Number(value.toPrecision(6)));
}

function pickParams(input: Record<string, unknown>): InstrumentParams {
  const params: InstrumentParams = {};
  for (const [key, value] of Object.entries(input)) {
    if (PROFILE_KEYS.has(key)) continue;
    if (typeof value === "number" || typeof value === "string") params[key] = value;
  }
  return params;
}
