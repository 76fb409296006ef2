"use client";

import type { ObservationCounts, TracingCounts } from "@/lib/tracer/measure";

export const COUNT_FIELDS = [
  ["groups", "g"],
  ["spots", "s"],
  ["northGroups", "gN"],
  ["northSpots", "sN"],
  ["southGroups", "gS"],
  ["southSpots", "sS"],
] as const;

export type CountKey = (typeof COUNT_FIELDS)[number][0];
export type CountDraft = Record<CountKey, string>;

export function countsToDraft(counts: TracingCounts | ObservationCounts): CountDraft {
  const text = (v: number | null) => (v === null ? "" : String(v));
  return {
    groups: text(counts.groups),
    spots: text(counts.spots),
    northGroups: text(counts.northGroups),
    northSpots: text(counts.northSpots),
    southGroups: text(counts.southGroups),
    southSpots: text(counts.southSpots),
  };
}

/**
 * The counts that go into the observation. They follow the tracing until the
 * observer types over one; each box then says how it differs from the tracing.
 */
export function CountsPanel({
  tracingCounts,
  storedCounts,
  draft,
  onChange,
  onReset,
  errors,
}: {
  tracingCounts: TracingCounts;
  storedCounts: ObservationCounts;
  /** Null while the counts simply follow the tracing. */
  draft: CountDraft | null;
  onChange: (key: CountKey, value: string) => void;
  onReset: () => void;
  errors: Record<string, string>;
}) {
  const shown = draft ?? countsToDraft(tracingCounts);
  const differs = COUNT_FIELDS.filter(([key]) => shown[key] !== String(tracingCounts[key]));
  return (
    <div className="flex flex-col gap-2">
      <div className="grid grid-cols-6 gap-1.5">
        {COUNT_FIELDS.map(([key, label]) => {
          const different = shown[key] !== String(tracingCounts[key]);
          const error = errors[key];
          return (
            <div key={key} className="flex flex-col gap-0.5">
              <label htmlFor={`count-${key}`} className="text-xs font-medium text-ink-700">
                {label}
              </label>
              <input
                id={`count-${key}`}
                inputMode="numeric"
                value={shown[key]}
                onChange={(e) => onChange(key, e.target.value)}
                aria-invalid={Boolean(error)}
                aria-describedby={different ? `count-${key}-differs` : undefined}
                className={`w-full rounded border px-1.5 py-1 text-sm ${
                  error
                    ? "border-caution-700"
                    : different
                      ? "border-corona-500 bg-corona-50"
                      : "border-ink-200"
                }`}
              />
              {different ? (
                <span id={`count-${key}-differs`} className="text-[11px] leading-tight text-corona-800">
                  tracing: {tracingCounts[key]}
                </span>
              ) : null}
            </div>
          );
        })}
      </div>
      {Object.entries(errors).map(([key, message]) => (
        <p key={key} role="alert" className="text-xs font-medium text-caution-700">
          {message}
        </p>
      ))}
      {differs.length > 0 ? (
        <p className="text-xs text-corona-800" data-testid="counts-differ">
          Your counts differ from the tracing in {differs.map(([, label]) => label).join(", ")}.{" "}
          <button type="button" className="underline" onClick={onReset}>
            Use the tracing&apos;s counts
          </button>
        </p>
      ) : (
        <p className="text-xs text-ink-500">
          The counts follow the tracing. Type over a box to change a count.
        </p>
      )}
      <p className="text-xs text-ink-500">
        In the Logbook now: g {storedCounts.groups}, s {storedCounts.spots}
        {storedCounts.northGroups !== null
          ? ` (north ${storedCounts.northGroups}/${storedCounts.northSpots}, south ${storedCounts.southGroups}/${storedCounts.southSpots})`
          : ""}
        .
      </p>
    </div>
  );
}
