"use client";

import Link from "next/link";
import { useMemo, useState } from "react";

import { SafetyNotice } from "@/components/safety-notice";
import { Button } from "@/components/ui/button";
import { Field, FormMessage, Input, Select } from "@/components/ui/field";
import {
  describeSafetyEmphasis,
  fillWithExample,
  INSTRUMENT_KIND_LABELS,
  INSTRUMENT_KINDS,
  KIND_FIELDS,
} from "@/lib/instruments/fields";
import { buildInstrumentDraft, convertFormValues, readInstrumentOptics } from "@/lib/instruments/profile";
import { computeSetupDiagram } from "@/lib/optics/diagram";
import { describeIncidenceEffect } from "@/lib/optics/incidence-effect";
import { planProjection } from "@/lib/optics/planner";
import type { InstrumentKind } from "@/lib/optics/types";
import type { UnitSystem } from "@/lib/optics/units";
import { solarOrientation } from "@/lib/solar/ephemeris";
import { instrumentInputSchema } from "@/lib/validation/instrument";
import { collectInstrumentErrors } from "@/lib/validation/instrument-messages";
import { plannerSettingsSchema } from "@/lib/validation/planner";

import { InstrumentFieldInput } from "../../instruments/_components/instrument-field-input";
import { UnitSystemToggle } from "../../instruments/_components/unit-system-toggle";
import { PlanResults } from "./plan-results";
import { SetupDiagram } from "./setup-diagram";

export type PlannerSource = { kind: "instrument"; id: string; name: string } | { kind: "trial" };

/**
 * The planner itself, entirely in the browser: every change re-plans with
 * the same functions the server would use, and nothing is saved. The values
 * are validated by the instrument schema so the planner only ever sees a
 * set-up the Instruments form would accept.
 */
export function PlannerWorkbench({
  source,
  initialValues,
  initialUnitSystem,
  todayDate,
}: {
  source: PlannerSource;
  initialValues: Record<string, string>;
  initialUnitSystem: UnitSystem;
  /** "YYYY-MM-DD" (UT) on the server, so the first render matches. */
  todayDate: string;
}) {
  const [values, setValues] = useState(initialValues);
  const [unitSystem, setUnitSystem] = useState(initialUnitSystem);
  const [date, setDate] = useState(todayDate);
  const [targetBlurPercent, setTargetBlurPercent] = useState("7");
  // A blank trial should not open full of errors: a box shows its error once touched.
  const [touched, setTouched] = useState<Set<string>>(
    () => new Set(source.kind === "instrument" ? Object.keys(initialValues) : []),
  );
  const kind = values.kind as InstrumentKind;

  const draft = useMemo(
    () =>
      buildInstrumentDraft({
        values: { ...values, name: source.kind === "instrument" ? source.name : "Trial set-up" },
        unitSystem,
      }),
    [values, unitSystem, source],
  );
  const parsed = useMemo(() => instrumentInputSchema.safeParse(draft), [draft]);
  const settings = useMemo(
    () => plannerSettingsSchema.safeParse({ date, targetBlurPercent }),
    [date, targetBlurPercent],
  );
  const semidiameterArcsec = useMemo(
    () => (settings.success ? solarOrientation(settings.data.date).semidiameterArcsec : undefined),
    [settings],
  );

  const fieldErrors = parsed.success
    ? {}
    : collectInstrumentErrors({ issues: parsed.error.issues, unitSystem });
  const settingsErrors = settings.success
    ? {}
    : collectInstrumentErrors({ issues: settings.error.issues, unitSystem });

  const result = useMemo(() => {
    if (!parsed.success || !settings.success) return null;
    const optics = readInstrumentOptics({ kind: parsed.data.kind, params: parsed.data });
    if (!optics) return null;
    try {
      const options = { semidiameterArcsec, targetBlurFraction: settings.data.targetBlurPercent / 100 };
      const plan = planProjection({ instrument: optics, options });
      return {
        optics,
        plan,
        diagram: computeSetupDiagram({ instrument: optics, plan, unitSystem }),
        incidenceRows:
          optics.kind === "mirror" ? describeIncidenceEffect({ instrument: optics, options }) : null,
      };
    } catch (error) {
      // The schema should have stopped anything the planner refuses; say so rather than crash the page.
      if (error instanceof RangeError) return null;
      throw error;
    }
  }, [parsed, settings, semidiameterArcsec, unitSystem]);

  const set = (name: string) => (value: string) => {
    setValues((v) => ({ ...v, [name]: value }));
    setTouched((t) => new Set(t).add(name));
  };
  const shownError = (name: string) => (touched.has(name) ? fieldErrors[name] : undefined);

  return (
    <div className="flex flex-col gap-6">
      <SafetyNotice emphasis={describeSafetyEmphasis({ kind })} />
      <div className="grid gap-6 lg:grid-cols-[minmax(0,1fr)_minmax(0,1.6fr)]">
        <section
          aria-label="Set-up"
          className="flex flex-col gap-4 self-start rounded-lg border border-ink-100 bg-white p-5 shadow-sm"
        >
          <div className="flex flex-wrap items-center justify-between gap-2">
            <h2 className="text-sm font-semibold text-ink-900">
              {source.kind === "instrument" ? source.name : "Try a set-up"}
            </h2>
            <UnitSystemToggle
              unitSystem={unitSystem}
              onChanged={(next) => {
                setValues((v) => convertFormValues({ values: v, from: unitSystem, to: next }));
                setUnitSystem(next);
              }}
            />
          </div>
          {source.kind === "trial" ? (
            <Field id="plan-kind" label="Kind">
              <Select
                id="plan-kind"
                value={kind}
                onChange={(e) =>
                  setValues((v) =>
                    fillWithExample({ values: v, kind: e.target.value as InstrumentKind, unitSystem }),
                  )
                }
              >
                {INSTRUMENT_KINDS.map((option) => (
                  <option key={option} value={option}>
                    {INSTRUMENT_KIND_LABELS[option]}
                  </option>
                ))}
              </Select>
            </Field>
          ) : (
            <p className="text-xs text-ink-500">{INSTRUMENT_KIND_LABELS[kind]}</p>
          )}
          {KIND_FIELDS[kind]?.map((field) => (
            <InstrumentFieldInput
              key={`${kind}-${field.name}`}
              field={field}
              unitSystem={unitSystem}
              value={values[field.name] ?? ""}
              error={shownError(field.name)}
              onChange={set(field.name)}
            />
          ))}
          <Field
            id="plan-date"
            label="Date"
            hint="The Sun's size changes by 3 % through the year."
            error={settingsErrors.date}
          >
            <Input
              id="plan-date"
              type="date"
              value={date}
              onChange={(e) => setDate(e.target.value)}
              aria-invalid={Boolean(settingsErrors.date)}
            />
          </Field>
          {kind === "mirror" ? (
            <Field
              id="plan-target"
              label="Blur to aim for"
              hint="As a share of the disk; about 7 % is what a ¼-inch mask at 35 ft gives."
              error={settingsErrors.targetBlurPercent}
              aside={<span className="w-8 shrink-0 text-sm text-ink-600">%</span>}
            >
              <Input
                id="plan-target"
                inputMode="decimal"
                value={targetBlurPercent}
                onChange={(e) => setTargetBlurPercent(e.target.value)}
                aria-invalid={Boolean(settingsErrors.targetBlurPercent)}
              />
            </Field>
          ) : null}
          <p className="text-xs text-ink-500">
            Nothing here is saved.{" "}
            {source.kind === "instrument" ? (
              <>
                To keep new values,{" "}
                <Link href={`/instruments/${source.id}/edit`} className="text-corona-700 underline">
                  edit the instrument
                </Link>
                .
              </>
            ) : (
              <>
                To keep a set-up,{" "}
                <Link href="/instruments/new" className="text-corona-700 underline">
                  add it as an instrument
                </Link>
                .
              </>
            )}
          </p>
          {source.kind === "instrument" ? (
            <Button
              variant="quiet"
              type="button"
              className="self-start"
              onClick={() => setValues(initialValues)}
            >
              Back to the saved values
            </Button>
          ) : null}
        </section>

        <section aria-label="Plan" aria-live="polite" className="flex flex-col gap-4">
          {result ? (
            <>
              <PlanResults
                instrument={result.optics}
                plan={result.plan}
                unitSystem={unitSystem}
                incidenceRows={result.incidenceRows}
              />
              <div className="rounded-lg border border-ink-100 bg-white p-4">
                <h3 className="mb-2 text-sm font-semibold text-ink-900">The set-up, to scale</h3>
                <SetupDiagram side={result.diagram.side} face={result.diagram.face} unitSystem={unitSystem} />
              </div>
            </>
          ) : (
            <FormMessage tone="info">
              {Object.keys(fieldErrors).some((name) => touched.has(name)) || !settings.success
                ? "Fix the values marked on the left to see the plan."
                : "Enter the sizes of the set-up on the left; the plan and the diagram appear as soon as they are complete."}
            </FormMessage>
          )}
        </section>
      </div>
    </div>
  );
}
