"use client";

import { useEffect, useRef } from "react";

import { useValidatedAction } from "@/components/classrooms/use-validated-action";
import { Button } from "@/components/ui/button";
import { Field, FormMessage, Input, Select } from "@/components/ui/field";
import { INSTRUMENT_KIND_LABELS, INSTRUMENT_KINDS } from "@/lib/instruments/fields";
import { sessionInputSchema } from "@/lib/validation/classroom";

import { scheduleSessionAction, type ScheduleState } from "../actions";

export function SessionForm({
  classroomId,
  defaults,
}: {
  classroomId: string;
  defaults: {
    day: string;
    opensAt: string;
    closesAt: string;
    instrumentName: string;
    instrumentKind: string;
  };
}) {
  const { state, pending, ready, onSubmit, errors } = useValidatedAction(
    scheduleSessionAction,
    { ok: false } as ScheduleState,
    sessionInputSchema,
  );
  const formRef = useRef<HTMLFormElement>(null);
  // A scheduled session clears the form, so the same session is not sent twice.
  useEffect(() => {
    if (state.ok) formRef.current?.reset();
  }, [state]);
  return (
    <form
      ref={formRef}
      noValidate
      aria-label="Schedule a session"
      onSubmit={onSubmit}
      className="flex flex-col gap-4"
    >
      <input type="hidden" name="classroomId" value={classroomId} />
      {state.message ? (
        <FormMessage tone={state.ok ? "success" : "error"}>{state.message}</FormMessage>
      ) : null}
      <Field
        id="session-title"
        label="Title"
        hint="e.g. Week 6: counting after the storm"
        error={errors.title}
      >
        <Input id="session-title" name="title" aria-invalid={Boolean(errors.title)} />
      </Field>
      <div className="grid gap-4 sm:grid-cols-3">
        <Field id="session-day" label="Day (UT)" error={errors.day}>
          <Input
            id="session-day"
            name="day"
            type="date"
            defaultValue={defaults.day}
            aria-invalid={Boolean(errors.day)}
          />
        </Field>
        <Field id="session-opens" label="Opens (UT)" error={errors.opensAt}>
          <Input
            id="session-opens"
            name="opensAt"
            type="time"
            defaultValue={defaults.opensAt}
            aria-invalid={Boolean(errors.opensAt)}
          />
        </Field>
        <Field id="session-closes" label="Closes (UT)" error={errors.closesAt}>
          <Input
            id="session-closes"
            name="closesAt"
            type="time"
            defaultValue={defaults.closesAt}
            aria-invalid={Boolean(errors.closesAt)}
          />
        </Field>
      </div>
      <p className="-mt-2 text-xs text-ink-500">
        Students can log their count only between these times (Universal Time).
      </p>
      <div className="grid gap-4 sm:grid-cols-2">
        <Field id="session-instrument" label="Instrument set up for the class" error={errors.instrumentName}>
          <Input
            id="session-instrument"
            name="instrumentName"
            defaultValue={defaults.instrumentName}
            aria-invalid={Boolean(errors.instrumentName)}
          />
        </Field>
        <Field id="session-kind" label="Kind" error={errors.instrumentKind}>
          <Select id="session-kind" name="instrumentKind" defaultValue={defaults.instrumentKind}>
            {INSTRUMENT_KINDS.map((kind) => (
              <option key={kind} value={kind}>
                {INSTRUMENT_KIND_LABELS[kind]}
              </option>
            ))}
          </Select>
        </Field>
      </div>
      <Button type="submit" disabled={!ready || pending} className="self-start">
        {pending ? "Scheduling…" : "Schedule session"}
      </Button>
    </form>
  );
}
