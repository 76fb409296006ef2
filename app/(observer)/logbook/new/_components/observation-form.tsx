"use client";

import Link from "next/link";
import { useRouter } from "next/navigation";
import { useMemo, useRef, useState } from "react";

import { ObservationPhotoField } from "@/components/photo/observation-photo-field";
import { PhotoAfterSave } from "@/components/photo/photo-after-save";
import type { AssistOutcome } from "@/components/photo/photo-assist";
import { Button } from "@/components/ui/button";
import { Field, FormMessage, Input, Select, TextArea } from "@/components/ui/field";
import { computeRelativeNumber } from "@/lib/counts/relative-number";
import { formatLocal, formatRelativeNumber, fromUtInputs, toUtInputs } from "@/lib/format/time";
import { fieldErrorsFromIssues } from "@/lib/validation/form-state";
import { observationInputSchema, SEEING_LABELS } from "@/lib/validation/observation";

type InstrumentOption = { id: string; name: string; k: number };
type Created = { id: string; relativeNumber: number; k: number; groups: number; spots: number };

const COUNT_FIELDS = ["groups", "spots", "northGroups", "northSpots", "southGroups", "southSpots"] as const;

/** crypto.randomUUID needs a secure context; getRandomValues works on plain http too. */
function makeIdempotencyKey(): string {
  const bytes = new Uint8Array(16);
  crypto.getRandomValues(bytes);
  return `obs-${Array.from(bytes, (b) => b.toString(16).padStart(2, "0")).join("")}`;
}

export function ObservationForm({
  instruments,
  timeZone,
  nowIso,
  endpoint = "/api/v1/observations",
  savedHref,
}: {
  instruments: InstrumentOption[];
  timeZone: string;
  /** The server's clock at render time, so the form opens on "now" in UT. */
  nowIso: string;
  /** Where the count is sent; a class session has its own (app/(observer)/class). */
  endpoint?: string;
  /** When set, a saved count opens this page instead of the "Count saved" panel. */
  savedHref?: string;
}) {
  const router = useRouter();
  const [date, setDate] = useState(() => toUtInputs(new Date(nowIso)).date);
  const [time, setTime] = useState(() => toUtInputs(new Date(nowIso)).time);
  const [values, setValues] = useState<Record<string, string>>({
    seeing: "3",
    instrumentId: instruments[0]?.id ?? "",
    groups: "",
    spots: "",
    northGroups: "",
    northSpots: "",
    southGroups: "",
    southSpots: "",
    notes: "",
  });
  const [split, setSplit] = useState(false);
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [message, setMessage] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  const [created, setCreated] = useState<Created | null>(null);
  // The photo is uploaded once the count is saved (it belongs to the saved observation).
  const [photo, setPhoto] = useState<File | null>(null);
  const [assist, setAssist] = useState<AssistOutcome | null>(null);
  // One key per filled-in form: a double click or a retry after a dropped
  // connection cannot log the same count twice.
  const idempotencyKey = useRef<string | null>(null);

  const observedAt = fromUtInputs(date, time);
  const localTime = observedAt ? formatLocal(observedAt, timeZone) : "";
  const instrument = instruments.find((i) => i.id === values.instrumentId);
  const preview = useMemo(() => {
    const g = Number(values.groups);
    const s = Number(values.spots);
    if (
      values.groups === "" ||
      values.spots === "" ||
      !Number.isInteger(g) ||
      !Number.isInteger(s) ||
      g < 0 ||
      s < 0
    )
      return null;
    return computeRelativeNumber({ k: instrument?.k ?? 1, groups: g, spots: s });
  }, [values.groups, values.spots, instrument]);

  const set =
    (name: string) =>
    (event: React.ChangeEvent<HTMLInputElement | HTMLSelectElement | HTMLTextAreaElement>) =>
      setValues((v) => ({ ...v, [name]: event.target.value }));

  async function submit(event: React.FormEvent) {
    event.preventDefault();
    setMessage(null);
    const draft: Record<string, unknown> = {
      observedAt: observedAt || undefined,
      seeing: values.seeing,
      instrumentId: values.instrumentId,
      groups: values.groups,
      spots: values.spots,
      notes: values.notes,
    };
    if (split) for (const key of COUNT_FIELDS.slice(2)) draft[key] = values[key];
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
          .map(([k, v]) => [k, COUNT_FIELDS.includes(k as never) || k === "seeing" ? Number(v) : v]),
      );
      const res = await fetch(endpoint, {
        method: "POST",
        headers: {
          "content-type": "application/json",
          "idempotency-key": (idempotencyKey.current ??= makeIdempotencyKey()),
          // Marks the count as typed into the Logbook form rather than sent by a script.
          "x-heliotally-client": "logbook-form",
        },
        body: JSON.stringify(payload),
      });
      const body = await res.json();
      if (!res.ok) {
        setErrors(fieldErrorsFromIssues(body?.error?.issues ?? []));
        setMessage(body?.error?.message ?? "The count could not be saved.");
        return;
      }
      if (savedHref) {
        router.push(savedHref);
        router.refresh();
        return;
      }
      setCreated(body as Created);
    } catch {
      setMessage("No connection to Heliotally. Your count is still here; try again.");
    } finally {
      setBusy(false);
    }
  }

  if (created) {
    return (
      <div className="flex flex-col gap-4 rounded-lg border border-meadow-200 bg-meadow-50 p-6" role="status">
        <p className="text-sm font-semibold tracking-wide text-meadow-700 uppercase">Count saved</p>
        <p className="text-3xl font-semibold text-ink-950">
          R = {formatRelativeNumber(created.relativeNumber)}
        </p>
        <p className="text-sm text-ink-700">
          {created.k.toFixed(2)} × (10 × {created.groups} + {created.spots}). It waits on the Review desk
          until your coordinator accepts it into the series.
        </p>
        {photo ? <PhotoAfterSave file={photo} assist={assist} observationId={created.id} /> : null}
        <div className="flex gap-3">
          <Link
            href="/logbook"
            className="rounded-md bg-corona-500 px-4 py-2 text-sm font-semibold text-umbra"
          >
            Open the Logbook
          </Link>
          <Link
            href={`/logbook/${created.id}/trace`}
            className="rounded-md border border-ink-200 bg-white px-4 py-2 text-sm font-semibold"
          >
            Trace the disk
          </Link>
          <button
            type="button"
            className="rounded-md border border-ink-200 bg-white px-4 py-2 text-sm font-semibold"
            onClick={() => {
              setCreated(null);
              setValues((v) => ({
                ...v,
                groups: "",
                spots: "",
                northGroups: "",
                northSpots: "",
                southGroups: "",
                southSpots: "",
                notes: "",
              }));
              idempotencyKey.current = null;
              setPhoto(null);
              setAssist(null);
            }}
          >
            Log another
          </button>
        </div>
      </div>
    );
  }

  return (
    <form
      noValidate
      onSubmit={submit}
      className="flex flex-col gap-5 rounded-lg border border-ink-100 bg-white p-6 shadow-sm"
    >
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
        <Field
          id="utTime"
          label="Time (UT)"
          hint={localTime ? `Your local time: ${localTime} (${timeZone})` : undefined}
        >
          <Input id="utTime" type="time" value={time} onChange={(e) => setTime(e.target.value)} />
        </Field>
      </div>
      <div className="grid gap-4 sm:grid-cols-2">
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
        <Field
          id="seeing"
          label="Seeing"
          hint="1 is a steady, sharp disk; 5 is boiling."
          error={errors.seeing}
        >
          <Select
            id="seeing"
            value={values.seeing}
            onChange={set("seeing")}
            aria-invalid={Boolean(errors.seeing)}
          >
            {Object.entries(SEEING_LABELS).map(([value, label]) => (
              <option key={value} value={value}>
                {label}
              </option>
            ))}
          </Select>
        </Field>
      </div>
      <div className="grid gap-4 sm:grid-cols-3">
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
        <div className="flex flex-col justify-end rounded-md bg-corona-50 px-3 py-2">
          <span className="text-xs text-ink-600">
            Relative number with k = {(instrument?.k ?? 1).toFixed(2)}
          </span>
          <span className="text-xl font-semibold text-ink-950" data-testid="r-preview">
            R = {preview === null ? "—" : formatRelativeNumber(preview)}
          </span>
        </div>
      </div>
      <div>
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
          <div className="mt-3 grid gap-4 sm:grid-cols-4">
            {(
              [
                ["northGroups", "North groups"],
                ["northSpots", "North spots"],
                ["southGroups", "South groups"],
                ["southSpots", "South spots"],
              ] as const
            ).map(([name, label]) => (
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
      </div>
      {savedHref ? null : (
        <ObservationPhotoField
          timeZone={timeZone}
          onPhotoChange={setPhoto}
          onAssistChange={setAssist}
          onUseTime={(at) => {
            const ut = toUtInputs(at);
            setDate(ut.date);
            setTime(ut.time);
          }}
          onUseSpotCount={(spots) => setValues((v) => ({ ...v, spots: String(spots) }))}
        />
      )}
      <Field
        id="notes"
        label="Notes (optional)"
        hint="Clouds, haze, anything a reviewer should know."
        error={errors.notes}
      >
        <TextArea id="notes" rows={3} value={values.notes} onChange={set("notes")} />
      </Field>
      <Button type="submit" disabled={busy} className="self-start">
        {busy ? "Saving…" : "Save count"}
      </Button>
    </form>
  );
}
