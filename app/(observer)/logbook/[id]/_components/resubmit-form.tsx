"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";

import { Button } from "@/components/ui/button";
import { Field, FormMessage, Input, Select, TextArea } from "@/components/ui/field";
import { fromUtInputs, toUtInputs } from "@/lib/format/time";
import { fieldErrorsFromIssues } from "@/lib/validation/form-state";
import { observationInputSchema, SEEING_LABELS } from "@/lib/validation/observation";

export type ResubmitValues = {
  observedAt: string;
  instrumentId: string;
  seeing: number;
  groups: number;
  spots: number;
  northGroups: number | null;
  northSpots: number | null;
  southGroups: number | null;
  southSpots: number | null;
  notes: string | null;
};

const HEMISPHERE_FIELDS = [
  ["northGroups", "North groups"],
  ["northSpots", "North spots"],
  ["southGroups", "South groups"],
  ["southSpots", "South spots"],
] as const;
const NUMBER_FIELDS = new Set([
  "seeing",
  "groups",
  "spots",
  "northGroups",
  "northSpots",
  "southGroups",
  "southSpots",
]);

const text = (v: number | string | null) => (v === null ? "" : String(v));

/**
 * "Edit and send back": the observer corrects a queried count. The same
 * schema as the Logbook form checks it here and again on the server (PUT
 * /api/v1/observations/[id]), which returns it to the Review desk.
 */
export function ResubmitForm({
  observationId,
  initial,
  instruments,
}: {
  observationId: string;
  initial: ResubmitValues;
  instruments: Array<{ id: string; name: string }>;
}) {
  const router = useRouter();
  const start = toUtInputs(new Date(initial.observedAt));
  const [date, setDate] = useState(start.date);
  const [time, setTime] = useState(start.time);
  const [values, setValues] = useState<Record<string, string>>({
    instrumentId: initial.instrumentId,
    seeing: text(initial.seeing),
    groups: text(initial.groups),
    spots: text(initial.spots),
    northGroups: text(initial.northGroups),
    northSpots: text(initial.northSpots),
    southGroups: text(initial.southGroups),
    southSpots: text(initial.southSpots),
    notes: text(initial.notes),
  });
  const [split, setSplit] = useState(initial.northGroups !== null || initial.southGroups !== null);
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [message, setMessage] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);

  const set =
    (name: string) => (e: React.ChangeEvent<HTMLInputElement | HTMLSelectElement | HTMLTextAreaElement>) =>
      setValues((v) => ({ ...v, [name]: e.target.value }));

  async function submit(event: React.FormEvent) {
    event.preventDefault();
    setMessage(null);
    const draft: Record<string, unknown> = {
      observedAt: fromUtInputs(date, time) || undefined,
      instrumentId: values.instrumentId,
      seeing: values.seeing,
      groups: values.groups,
      spots: values.spots,
      notes: values.notes,
    };
    if (split) for (const [key] of HEMISPHERE_FIELDS) draft[key] = values[key];
    const parsed = observationInputSchema.safeParse(draft);
    if (!parsed.success) {
      setErrors(fieldErrorsFromIssues(parsed.error.issues));
      return;
    }
    setErrors({});
    setBusy(true);
    try {
      const payload = Object.fromEntries(
        Object.entries(draft)
          .filter(([, v]) => v !== "" && v !== undefined)
          .map(([k, v]) => [k, NUMBER_FIELDS.has(k) ? Number(v) : v]),
      );
      const res = await fetch(`/api/v1/observations/${observationId}`, {
        method: "PUT",
        headers: { "content-type": "application/json" },
        body: JSON.stringify(payload),
      });
      const body = await res.json();
      if (!res.ok) {
        setErrors(fieldErrorsFromIssues(body?.error?.issues ?? []));
        setMessage(body?.error?.message ?? "The count could not be sent back.");
        return;
      }
      router.refresh();
    } catch {
      setMessage("No connection to Heliotally. Your corrections are still here; try again.");
    } finally {
      setBusy(false);
    }
  }

  return (
    <form noValidate onSubmit={submit} className="flex flex-col gap-4" aria-label="Edit and send back">
      {message ? <FormMessage tone="error">{message}</FormMessage> : null}
      <div className="grid gap-4 sm:grid-cols-2">
        <Field id="utDate" label="Date (UT)" error={errors.observedAt}>
          <Input
            id="utDate"
            type="date"
            value={date}
            onChange={(e) => setDate(e.target.value)}
            aria-invalid={Boolean(errors.observedAt)}
          />
        </Field>
        <Field id="utTime" label="Time (UT)">
          <Input id="utTime" type="time" value={time} onChange={(e) => setTime(e.target.value)} />
        </Field>
        <Field id="instrumentId" label="Instrument" error={errors.instrumentId}>
          <Select
            id="instrumentId"
            value={values.instrumentId}
            onChange={set("instrumentId")}
            aria-invalid={Boolean(errors.instrumentId)}
          >
            {instruments.map((i) => (
              <option key={i.id} value={i.id}>
                {i.name}
              </option>
            ))}
          </Select>
        </Field>
        <Field id="seeing" label="Seeing" error={errors.seeing}>
          <Select id="seeing" value={values.seeing} onChange={set("seeing")}>
            {Object.entries(SEEING_LABELS).map(([value, label]) => (
              <option key={value} value={value}>
                {label}
              </option>
            ))}
          </Select>
        </Field>
        <Field id="groups" label="Groups (g)" error={errors.groups}>
          <Input
            id="groups"
            inputMode="numeric"
            value={values.groups}
            onChange={set("groups")}
            aria-invalid={Boolean(errors.groups)}
          />
        </Field>
        <Field id="spots" label="Spots (s)" error={errors.spots}>
          <Input
            id="spots"
            inputMode="numeric"
            value={values.spots}
            onChange={set("spots")}
            aria-invalid={Boolean(errors.spots)}
          />
        </Field>
      </div>
      <label className="flex items-center gap-2 text-sm font-medium text-ink-800">
        <input
          type="checkbox"
          checked={split}
          onChange={(e) => setSplit(e.target.checked)}
          className="size-4 accent-corona-600"
        />
        I also counted each hemisphere
      </label>
      {split ? (
        <div className="grid gap-4 sm:grid-cols-4">
          {HEMISPHERE_FIELDS.map(([name, label]) => (
            <Field key={name} id={name} label={label} error={errors[name]}>
              <Input
                id={name}
                inputMode="numeric"
                value={values[name]}
                onChange={set(name)}
                aria-invalid={Boolean(errors[name])}
              />
            </Field>
          ))}
        </div>
      ) : null}
      <Field
        id="notes"
        label="Notes"
        hint="Say what you changed, or why the count stands."
        error={errors.notes}
      >
        <TextArea id="notes" rows={3} value={values.notes} onChange={set("notes")} />
      </Field>
      <Button type="submit" disabled={busy} className="self-start">
        {busy ? "Sending…" : "Send back for review"}
      </Button>
    </form>
  );
}
