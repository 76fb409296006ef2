"use client";

import { Field, Input, Select } from "@/components/ui/field";
import { describeFieldUnit, SURFACE_OPTIONS, type FieldSpec } from "@/lib/instruments/fields";
import type { UnitSystem } from "@/lib/optics/units";

/** One box of an instrument's optics, with its unit beside it and its error under it. */
export function InstrumentFieldInput({
  field,
  unitSystem,
  value,
  error,
  onChange,
  idPrefix = "",
}: {
  field: FieldSpec;
  unitSystem: UnitSystem;
  value: string;
  error?: string;
  onChange: (value: string) => void;
  /** Keeps ids unique when two forms share a page. */
  idPrefix?: string;
}) {
  const id = `${idPrefix}${field.name}`;
  const unit = describeFieldUnit({ field, unitSystem });
  const described = error ? `${id}-error` : field.hint ? `${id}-hint` : undefined;
  if (field.input === "surface") {
    return (
      <Field id={id} label={field.label} hint={field.hint} error={error}>
        <Select
          id={id}
          value={value}
          onChange={(e) => onChange(e.target.value)}
          aria-invalid={Boolean(error)}
          aria-describedby={described}
        >
          <option value="">Choose…</option>
          {SURFACE_OPTIONS.map((option) => (
            <option key={option.value} value={option.value}>
              {option.label}
            </option>
          ))}
        </Select>
      </Field>
    );
  }
  return (
    <Field
      id={id}
      label={field.label}
      hint={field.hint}
      error={error}
      aside={
        unit ? (
          <span className="w-8 shrink-0 text-sm text-ink-600" data-testid={`${id}-unit`}>
            {unit}
          </span>
        ) : undefined
      }
    >
      <Input
        id={id}
        inputMode={field.input === "text" ? "text" : "decimal"}
        autoComplete="off"
        value={value}
        onChange={(e) => onChange(e.target.value)}
        aria-invalid={Boolean(error)}
        aria-describedby={described}
      />
    </Field>
  );
}
