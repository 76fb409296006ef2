import type { ComponentProps, ReactNode } from "react";

/** A labelled form control with its hint and its error, tied together for screen readers. */
export function Field({
  id,
  label,
  hint,
  error,
  children,
  aside,
}: {
  id: string;
  label: string;
  hint?: ReactNode;
  error?: string;
  children: ReactNode;
  aside?: ReactNode;
}) {
  return (
    <div className="flex flex-col gap-1">
      <label htmlFor={id} className="text-sm font-medium text-ink-800">
        {label}
      </label>
      <div className="flex items-center gap-3">
        {children}
        {aside}
      </div>
      {hint && !error ? (
        <p id={`${id}-hint`} className="text-xs text-ink-500">
          {hint}
        </p>
      ) : null}
      {error ? (
        <p id={`${id}-error`} role="alert" className="text-sm font-medium text-caution-700">
          {error}
        </p>
      ) : null}
    </div>
  );
}

export const inputClass =
  "w-full rounded-md border border-ink-200 bg-white px-3 py-2 text-sm text-ink-900 shadow-sm placeholder:text-ink-300 focus:border-corona-500 aria-[invalid=true]:border-caution-700";

export function Input({ className = "", ...props }: ComponentProps<"input">) {
  return <input className={`${inputClass} ${className}`} {...props} />;
}

export function Select({ className = "", ...props }: ComponentProps<"select">) {
  return <select className={`${inputClass} ${className}`} {...props} />;
}

export function TextArea({ className = "", ...props }: ComponentProps<"textarea">) {
  return <textarea className={`${inputClass} ${className}`} {...props} />;
}

export function FormMessage({ tone, children }: { tone: "error" | "success" | "info"; children: ReactNode }) {
  const tones = {
    error: "border-caution-200 bg-caution-50 text-caution-800",
    success: "border-meadow-200 bg-meadow-50 text-meadow-700",
    info: "border-ink-200 bg-ink-50 text-ink-700",
  };
  return (
    <div
      role={tone === "error" ? "alert" : "status"}
      className={`rounded-md border px-4 py-3 text-sm ${tones[tone]}`}
    >
      {children}
    </div>
  );
}

/** A labelled filter control above a table: the label on top, the control (a Select or Input) below. */
export function FilterField({
  id,
  label,
  className = "",
  children,
}: {
  id: string;
  label: string;
  className?: string;
  children: ReactNode;
}) {
  return (
    <div className={`flex flex-col gap-1 text-sm ${className}`}>
      <label htmlFor={id} className="font-medium text-ink-700">
        {label}
      </label>
      {children}
    </div>
  );
}

/** A UT-date filter above a table; `onChange` gets the new "YYYY-MM-DD" (or "" when cleared). */
export function DateFilter({
  id,
  label,
  value,
  onChange,
}: {
  id: string;
  label: string;
  value: string;
  onChange: (value: string) => void;
}) {
  return (
    <FilterField id={id} label={label}>
      <Input id={id} type="date" value={value} onChange={(e) => onChange(e.target.value)} />
    </FilterField>
  );
}

/**
 * A choice filter above a table: its first option, `anyLabel`, is the empty
 * value (no filtering); `onChange` gets the value chosen.
 */
export function SelectFilter({
  id,
  label,
  value,
  onChange,
  anyLabel,
  options,
  className = "w-56",
}: {
  id: string;
  label: string;
  value: string;
  onChange: (value: string) => void;
  anyLabel: string;
  options: ReadonlyArray<{ value: string; label: string }>;
  className?: string;
}) {
  return (
    <FilterField id={id} label={label} className={className}>
      <Select id={id} value={value} onChange={(e) => onChange(e.target.value)}>
        <option value="">{anyLabel}</option>
        {options.map((option) => (
          <option key={option.value} value={option.value}>
            {option.label}
          </option>
        ))}
      </Select>
    </FilterField>
  );
}

/** Shown beside a table's filters once any is set; puts every filter back. */
export function ClearFiltersButton({ onClear }: { onClear: () => void }) {
  return (
    <button type="button" className="pb-2 text-sm text-corona-700 underline" onClick={onClear}>
      Clear filters
    </button>
  );
}
