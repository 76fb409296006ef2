/**
 * A stored profile as short labelled values in the reader's units, for
 * lists and detail pages ("Throw distance: 35 ft").
 */

import { formatLength, lengthFieldUnit, type UnitSystem } from "@/lib/optics/units";

import { isLengthField, KIND_FIELDS, SURFACE_OPTIONS } from "./fields";

export function describeInstrumentDimensions({
  kind,
  params,
  unitSystem,
}: {
  kind: string;
  params: unknown;
  unitSystem: UnitSystem;
}): Array<{ label: string; value: string }> {
  const fields = KIND_FIELDS[kind as keyof typeof KIND_FIELDS] ?? [];
  const values = typeof params === "object" && params !== null ? (params as Record<string, unknown>) : {};
  const out: Array<{ label: string; value: string }> = [];
  for (const field of fields) {
    const raw = values[field.name];
    if (raw === undefined || raw === null || raw === "") continue;
    const label = field.label.replace(" (optional)", "");
    if (isLengthField(field.name) && typeof raw === "number") {
      const unit = lengthFieldUnit({ field: field.name, unitSystem });
      out.push({ label, value: formatLength({ valueMm: raw, unitSystem, unit, significantDigits: 4 }) });
    } else if (field.input === "surface") {
      out.push({ label, value: SURFACE_OPTIONS.find((o) => o.value === raw)?.label ?? String(raw) });
    } else if (field.input === "number" && typeof raw === "number") {
      const number = new Intl.NumberFormat("en", { maximumSignificantDigits: 4 }).format(raw);
      out.push({
        label,
        value:
          field.unit === "°" || field.unit === "×" ? `${number}${field.unit}` : `${number} ${field.unit}`,
      });
    } else {
      out.push({ label, value: String(raw) });
    }
  }
  return out;
}
