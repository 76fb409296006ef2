"use client";

import { useActionState, useState } from "react";

import { Button } from "@/components/ui/button";
import { Field, Input } from "@/components/ui/field";
import { OUTLIER_THRESHOLD_MAX, OUTLIER_THRESHOLD_MIN } from "@/lib/validation/review";

import { saveReviewSettingsAction } from "../actions";

export function ReviewSettingsForm({ outlierThreshold }: { outlierThreshold: number }) {
  const [state, action, pending] = useActionState(saveReviewSettingsAction, { ok: false });
  // Controlled, so a refused value stays in the box beside its message instead of being reset.
  const [value, setValue] = useState(String(outlierThreshold));
  const error = state.fieldErrors?.outlierThreshold;
  return (
    <details className="rounded-lg border border-ink-100 bg-white px-4 py-3 text-sm shadow-sm">
      <summary className="cursor-pointer font-semibold text-ink-800">
        Flag settings{" "}
        <span className="font-normal text-ink-500">
          · far from the network above {outlierThreshold} robust σ
        </span>
      </summary>
      <form action={action} noValidate className="mt-3 flex flex-wrap items-end gap-4">
        <div className="w-48">
          <Field
            id="outlierThreshold"
            label="Outlier threshold (robust σ)"
            hint={`Between ${OUTLIER_THRESHOLD_MIN} and ${OUTLIER_THRESHOLD_MAX}; 3 is usual.`}
            error={error}
          >
            <Input
              id="outlierThreshold"
              name="outlierThreshold"
              inputMode="decimal"
              value={value}
              onChange={(e) => setValue(e.target.value)}
              aria-invalid={Boolean(error)}
              aria-describedby={error ? "outlierThreshold-error" : "outlierThreshold-hint"}
            />
          </Field>
        </div>
        <Button type="submit" variant="secondary" disabled={pending}>
          {pending ? "Saving…" : "Save and re-check the queue"}
        </Button>
        <p className="basis-full text-xs text-ink-500">
          A count is flagged when its scaled value k(10g + s) lies further than this many robust standard
          deviations (scaled median absolute deviation) from the median of the other observers&apos; counts
          that UT day.
        </p>
        {state.message ? (
          <p
            role={state.ok ? "status" : "alert"}
            className={`basis-full text-sm ${state.ok ? "text-meadow-700" : "text-caution-700"}`}
          >
            {state.message}
          </p>
        ) : null}
      </form>
    </details>
  );
}
