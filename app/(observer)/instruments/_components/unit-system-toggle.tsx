"use client";

import { useRouter } from "next/navigation";
import { useState, useTransition } from "react";

import type { UnitSystem } from "@/lib/optics/units";

import { setUnitSystemAction } from "../actions";

const OPTIONS: Array<{ value: UnitSystem; label: string; hint: string }> = [
  { value: "metric", label: "Metric", hint: "mm and m" },
  { value: "imperial", label: "Imperial", hint: "inches and feet" },
];

/**
 * The observer's unit preference, saved to their profile at once. Forms that
 * hold typed values pass onChanged to convert them before the new units show.
 */
export function UnitSystemToggle({
  unitSystem,
  onChanged,
}: {
  unitSystem: UnitSystem;
  onChanged?: (next: UnitSystem) => void;
}) {
  const router = useRouter();
  const [error, setError] = useState<string | null>(null);
  const [pending, startTransition] = useTransition();

  function choose(next: UnitSystem) {
    if (next === unitSystem || pending) return;
    setError(null);
    startTransition(async () => {
      const result = await setUnitSystemAction({ unitSystem: next });
      if (!result.ok) {
        setError(result.message ?? result.fieldErrors?.unitSystem ?? "Your units could not be saved.");
        return;
      }
      onChanged?.(next);
      router.refresh();
    });
  }

  return (
    <div className="flex flex-col items-start gap-1">
      <div
        role="group"
        aria-label="Units"
        className="inline-flex rounded-md border border-ink-200 bg-white p-0.5"
      >
        {OPTIONS.map((option) => (
          <button
            key={option.value}
            type="button"
            aria-pressed={option.value === unitSystem}
            title={option.hint}
            disabled={pending}
            onClick={() => choose(option.value)}
            className={`rounded px-3 py-1 text-sm font-medium transition-colors ${
              option.value === unitSystem ? "bg-ink-900 text-white" : "text-ink-700 hover:bg-ink-50"
            }`}
          >
            {option.label}
          </button>
        ))}
      </div>
      {error ? (
        <p role="alert" className="text-sm text-caution-700">
          {error}
        </p>
      ) : null}
    </div>
  );
}
