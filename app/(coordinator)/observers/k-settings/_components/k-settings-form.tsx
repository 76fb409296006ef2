"use client";

import { useRouter } from "next/navigation";
import { useState, type FormEvent } from "react";

import { Button } from "@/components/ui/button";
import { Field, FormMessage, Input, Select } from "@/components/ui/field";
import { K_METHODS } from "@/lib/counts/k-coefficient";
import {
  K_METHOD_LABELS,
  kSettingsSchema,
  NETWORK_REFERENCE,
  type KSettings,
} from "@/lib/validation/k-settings";
import { fieldErrorsFromZod } from "@/lib/validation/form-state";

/** The k settings, checked here with the same schema the server uses, then saved with PUT /api/v1/k-settings. */
export function KSettingsForm({
  settings,
  observers,
  references,
}: {
  settings: KSettings;
  observers: Array<{ id: string; displayName: string; code: string; acceptedCounts: number }>;
  references: Array<{ id: string; name: string; days: number }>;
}) {
  const router = useRouter();
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [message, setMessage] = useState<{ tone: "success" | "error"; text: string } | null>(null);
  const [saving, setSaving] = useState(false);

  async function submit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    setMessage(null);
    const values = Object.fromEntries(new FormData(event.currentTarget));
    const parsed = kSettingsSchema.safeParse(values);
    if (!parsed.success) {
      setErrors(fieldErrorsFromZod(parsed.error));
      return;
    }
    setErrors({});
    setSaving(true);
    try {
      const res = await fetch("/api/v1/k-settings", {
        method: "PUT",
        headers: { "content-type": "application/json" },
        body: JSON.stringify(values),
      });
      const body = await res.json();
      if (!res.ok) {
        const issues = (body?.error?.issues ?? []) as Array<{ path: string; message: string }>;
        setErrors(Object.fromEntries(issues.map((i) => [i.path, i.message])));
        setMessage({ tone: "error", text: body?.error?.message ?? "The settings were not saved." });
        return;
      }
      setMessage({
        tone: "success",
        text: "Saved. Run a full recompute to fit every k with these settings.",
      });
      router.refresh();
    } catch {
      setMessage({
        tone: "error",
        text: "The settings could not be sent. Check the connection and try again.",
      });
    } finally {
      setSaving(false);
    }
  }

  const invalid = (name: string) =>
    errors[name] ? { "aria-invalid": true, "aria-describedby": `${name}-error` } : {};

  return (
    <section
      aria-labelledby="settings-heading"
      className="flex flex-col gap-4 rounded-lg border border-ink-100 bg-white p-5 shadow-sm"
    >
      <h2 id="settings-heading" className="text-lg font-semibold text-ink-900">
        How k is fitted
      </h2>
      <form onSubmit={submit} noValidate className="flex flex-col gap-4">
        <Field
          id="periodKind"
          label="Period"
          error={errors.periodKind}
          hint="One k per observer and instrument for each period."
        >
          <Select
            id="periodKind"
            name="periodKind"
            defaultValue={settings.periodKind}
            {...invalid("periodKind")}
          >
            <option value="quarter">Quarter</option>
            <option value="year">Year</option>
          </Select>
        </Field>
        <Field
          id="method"
          label="Method"
          error={errors.method}
          hint="Ratio of sums weighs busy days more and is the least biased by counting noise."
        >
          <Select id="method" name="method" defaultValue={settings.method} {...invalid("method")}>
            {K_METHODS.map((m) => (
              <option key={m} value={m}>
                {K_METHOD_LABELS[m]}
              </option>
            ))}
          </Select>
        </Field>
        <Field
          id="minCommonDays"
          label="Minimum of common days"
          error={errors.minCommonDays}
          hint="No k is kept from fewer days than this."
        >
          <Input
            id="minCommonDays"
            name="minCommonDays"
            inputMode="numeric"
            defaultValue={settings.minCommonDays}
            {...invalid("minCommonDays")}
          />
        </Field>
        <Field id="referenceSeriesId" label="Reference" error={errors.referenceSeriesId}>
          <Select
            id="referenceSeriesId"
            name="referenceSeriesId"
            defaultValue={settings.referenceSeriesId}
            {...invalid("referenceSeriesId")}
          >
            <option value={NETWORK_REFERENCE}>The network itself (pilot held fixed)</option>
            {references.map((r) => (
              <option key={r.id} value={r.id}>
                {r.name} ({r.days} days)
              </option>
            ))}
          </Select>
        </Field>
        <Field
          id="pilotObserverId"
          label="Pilot observer"
          error={errors.pilotObserverId}
          hint="With the network as reference, the pilot's k is held fixed and sets the scale. Automatic picks the observer with the most accepted counts."
        >
          <Select
            id="pilotObserverId"
            name="pilotObserverId"
            defaultValue={settings.pilotObserverId ?? ""}
            {...invalid("pilotObserverId")}
          >
            <option value="">Automatic</option>
            {observers.map((o) => (
              <option key={o.id} value={o.id}>
                {o.displayName} ({o.code}) · {o.acceptedCounts} counts
              </option>
            ))}
          </Select>
        </Field>
        <Field id="pilotK" label="Pilot's k" error={errors.pilotK}>
          <Input
            id="pilotK"
            name="pilotK"
            inputMode="decimal"
            defaultValue={settings.pilotK}
            {...invalid("pilotK")}
          />
        </Field>
        <Field
          id="driftFraction"
          label="Drift alert threshold"
          error={errors.driftFraction}
          hint="A fraction: 0.1 alerts when k moves by more than 10 % between periods."
        >
          <Input
            id="driftFraction"
            name="driftFraction"
            inputMode="decimal"
            defaultValue={settings.driftFraction}
            {...invalid("driftFraction")}
          />
        </Field>
        {message ? <FormMessage tone={message.tone}>{message.text}</FormMessage> : null}
        <div>
          <Button type="submit" disabled={saving}>
            {saving ? "Saving…" : "Save settings"}
          </Button>
        </div>
      </form>
    </section>
  );
}
