"use client";

import Link from "next/link";
import { useRouter } from "next/navigation";
import { useMemo, useRef, useState } from "react";

import { SafetyNotice } from "@/components/safety-notice";
import { Button } from "@/components/ui/button";
import { Field, FormMessage, Input, TextArea } from "@/components/ui/field";
import {
  describeSafetyEmphasis,
  INSTRUMENT_KIND_HINTS,
  INSTRUMENT_KIND_LABELS,
  INSTRUMENT_KINDS,
  KIND_FIELDS,
} from "@/lib/instruments/fields";
import { buildInstrumentDraft, convertFormValues } from "@/lib/instruments/profile";
import { getProjectedDiskDiameterMm } from "@/lib/optics/disk-size";
import type { InstrumentKind } from "@/lib/optics/types";
import { formatLength, type UnitSystem } from "@/lib/optics/units";
import { instrumentInputSchema } from "@/lib/validation/instrument";
import { collectInstrumentErrors } from "@/lib/validation/instrument-messages";

import { InstrumentFieldInput } from "./instrument-field-input";
import { UnitSystemToggle } from "./unit-system-toggle";

/** crypto.randomUUID needs a secure context; getRandomValues works on plain http too. */
function makeIdempotencyKey(): string {
  const bytes = new Uint8Array(16);
  crypto.getRandomValues(bytes);
  return `ins-${Array.from(bytes, (b) => b.toString(16).padStart(2, "0")).join("")}`;
}

export function InstrumentForm({
  instrumentId,
  initialValues,
  initialUnitSystem,
  kindLockedReason,
  todayIso,
}: {
  /** Editing this instrument; absent when adding one. */
  instrumentId?: string;
  initialValues: Record<string, string>;
  initialUnitSystem: UnitSystem;
  /** Set when observations already use the instrument, so its kind cannot change. */
  kindLockedReason?: string;
  todayIso: string;
}) {
  const router = useRouter();
  const [values, setValues] = useState<Record<string, string>>(initialValues);
  const [unitSystem, setUnitSystem] = useState<UnitSystem>(initialUnitSystem);
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [message, setMessage] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  // One key per filled-in form: a double click cannot add the instrument twice.
  const idempotencyKey = useRef<string | null>(null);
  const formRef = useRef<HTMLFormElement>(null);

  const kind = values.kind as InstrumentKind;
  const parsed = useMemo(
    () => instrumentInputSchema.safeParse(buildInstrumentDraft({ values, unitSystem })),
    [values, unitSystem],
  );
  const diskMm = parsed.success
    ? getProjectedDiskDiameterMm({ instrument: parsed.data, at: new Date(todayIso) })
    : null;

  const set = (name: string) => (value: string) => {
    setValues((v) => ({ ...v, [name]: value }));
    // The message described the old value; the next save checks the new one.
    setErrors((current) => Object.fromEntries(Object.entries(current).filter(([key]) => key !== name)));
    idempotencyKey.current = null;
  };

  function showErrors(next: Record<string, string>) {
    setErrors(next);
    // Move focus to the first box that needs attention, so keyboard and screen-reader users land on it.
    requestAnimationFrame(() => {
      formRef.current?.querySelector<HTMLElement>("[aria-invalid=true]")?.focus();
    });
  }

  async function submit(event: React.FormEvent) {
    event.preventDefault();
    setMessage(null);
    if (!parsed.success) {
      showErrors(collectInstrumentErrors({ issues: parsed.error.issues, unitSystem }));
      setMessage("Some fields need attention; nothing has been saved.");
      return;
    }
    setErrors({});
    setBusy(true);
    try {
      const res = await fetch(instrumentId ? `/api/v1/instruments/${instrumentId}` : "/api/v1/instruments", {
        method: instrumentId ? "PUT" : "POST",
        headers: {
          "content-type": "application/json",
          "idempotency-key": (idempotencyKey.current ??= makeIdempotencyKey()),
        },
        body: JSON.stringify(parsed.data),
      });
      const body = await res.json();
      if (!res.ok) {
        showErrors(collectInstrumentErrors({ issues: body?.error?.issues ?? [], unitSystem }));
        setMessage(`${body?.error?.message ?? "The instrument could not be saved."} Nothing has been saved.`);
        return;
      }
      router.push(`/instruments/${body.id}?saved=1`);
      router.refresh();
    } catch {
      setMessage("No connection to Heliotally. Your values are still here; try again.");
    } finally {
      setBusy(false);
    }
  }

  return (
    <div className="grid gap-6 lg:grid-cols-[2fr_1fr]">
      <form
        ref={formRef}
        noValidate
        onSubmit={submit}
        className="flex flex-col gap-5 rounded-lg border border-ink-100 bg-white p-6 shadow-sm"
      >
        {message ? <FormMessage tone="error">{message}</FormMessage> : null}
        <div className="flex flex-wrap items-center justify-between gap-3">
          <p className="text-sm text-ink-600">
            Lengths are entered in {unitSystem === "imperial" ? "inches and feet" : "millimetres and metres"}.
          </p>
          <UnitSystemToggle
            unitSystem={unitSystem}
            onChanged={(next) => {
              setValues((v) => convertFormValues({ values: v, from: unitSystem, to: next }));
              setUnitSystem(next);
              setErrors({});
            }}
          />
        </div>
        {errors.unitSystem ? (
          <p role="alert" className="text-sm font-medium text-caution-700">
            {errors.unitSystem}
          </p>
        ) : null}

        <Field
          id="name"
          label="Name"
          hint="How it appears in your Logbook, e.g. 'Hallway mirror'."
          error={errors.name}
        >
          <Input
            id="name"
            value={values.name ?? ""}
            onChange={(e) => set("name")(e.target.value)}
            aria-invalid={Boolean(errors.name)}
            maxLength={120}
          />
        </Field>

        <fieldset className="flex flex-col gap-2">
          <legend className="mb-1 text-sm font-medium text-ink-800">Kind</legend>
          <div className="grid gap-2 sm:grid-cols-2">
            {INSTRUMENT_KINDS.map((option) => (
              <label
                key={option}
                className={`flex cursor-pointer flex-col rounded-md border px-3 py-2 text-sm ${
                  option === kind ? "border-corona-500 bg-corona-50" : "border-ink-200 bg-white"
                } ${kindLockedReason && option !== kind ? "cursor-not-allowed opacity-50" : ""}`}
              >
                <span className="flex items-center gap-2 font-medium text-ink-900">
                  <input
                    type="radio"
                    name="kind"
                    value={option}
                    checked={option === kind}
                    disabled={Boolean(kindLockedReason) && option !== kind}
                    onChange={() => {
                      set("kind")(option);
                      setErrors({});
                    }}
                    className="accent-corona-600"
                  />
                  {INSTRUMENT_KIND_LABELS[option]}
                </span>
                <span className="mt-0.5 pl-6 text-xs text-ink-500">{INSTRUMENT_KIND_HINTS[option]}</span>
              </label>
            ))}
          </div>
          {kindLockedReason ? <p className="text-xs text-ink-500">{kindLockedReason}</p> : null}
          {errors.kind ? (
            <p id="kind-error" role="alert" className="text-sm font-medium text-caution-700">
              {errors.kind}
            </p>
          ) : null}
        </fieldset>

        <div className="grid gap-4 sm:grid-cols-2">
          {KIND_FIELDS[kind]?.map((field) => (
            <InstrumentFieldInput
              key={`${kind}-${field.name}`}
              field={field}
              unitSystem={unitSystem}
              value={values[field.name] ?? ""}
              error={errors[field.name]}
              onChange={set(field.name)}
            />
          ))}
        </div>

        <Field
          id="notes"
          label="Notes (optional)"
          hint="Where it stands, what you changed and when."
          error={errors.notes}
        >
          <TextArea
            id="notes"
            rows={3}
            value={values.notes ?? ""}
            onChange={(e) => set("notes")(e.target.value)}
          />
        </Field>

        <div
          className="rounded-md bg-corona-50 px-3 py-2 text-sm text-ink-800"
          data-testid="disk-preview"
          aria-live="polite"
        >
          {diskMm !== null
            ? `With these values the projected disk is ${formatLength({ valueMm: diskMm, unitSystem })} across today.`
            : kind === "camera" || kind === "filtered-telescope"
              ? "This kind does not project the disk onto a card; the planner shows what it will resolve."
              : "Fill in the sizes to see how large the disk will be."}
        </div>

        <div className="flex flex-wrap items-center gap-3">
          <Button type="submit" disabled={busy}>
            {busy ? "Saving…" : instrumentId ? "Save changes" : "Add instrument"}
          </Button>
          <Link
            href={instrumentId ? `/instruments/${instrumentId}` : "/instruments"}
            className="text-sm text-corona-700 underline"
          >
            Cancel
          </Link>
        </div>
      </form>
      <div className="flex flex-col gap-4">
        <SafetyNotice emphasis={describeSafetyEmphasis({ kind })} />
      </div>
    </div>
  );
}
