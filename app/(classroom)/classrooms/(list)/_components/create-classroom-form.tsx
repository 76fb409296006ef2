"use client";

import { useRouter } from "next/navigation";
import { useEffect } from "react";

import { useValidatedAction } from "@/components/classrooms/use-validated-action";
import { Button } from "@/components/ui/button";
import { Field, FormMessage, Input } from "@/components/ui/field";
import { classroomInputSchema } from "@/lib/validation/classroom";

import { createClassroomAction, type CreateClassroomState } from "../actions";

export function CreateClassroomForm({ today }: { today: string }) {
  const router = useRouter();
  const { state, pending, ready, onSubmit, errors } = useValidatedAction(
    createClassroomAction,
    { ok: false } as CreateClassroomState,
    classroomInputSchema,
  );

  useEffect(() => {
    if (state.ok && state.classroomId) router.push(`/classrooms/${state.classroomId}`);
  }, [state, router]);

  return (
    <form
      noValidate
      aria-label="New classroom"
      onSubmit={onSubmit}
      className="flex flex-col gap-4 rounded-lg border border-ink-100 bg-white p-5 shadow-sm"
    >
      <h2 className="text-lg font-semibold text-ink-950">New classroom</h2>
      {state.message ? (
        <FormMessage tone={state.ok ? "success" : "error"}>{state.message}</FormMessage>
      ) : null}
      <Field id="name" label="Class name" hint="e.g. Year 8 science club" error={errors.name}>
        <Input id="name" name="name" aria-invalid={Boolean(errors.name)} />
      </Field>
      <Field id="school" label="School" error={errors.school}>
        <Input id="school" name="school" aria-invalid={Boolean(errors.school)} />
      </Field>
      <div className="grid gap-4 sm:grid-cols-2">
        <Field id="termStart" label="First day of term" error={errors.termStart}>
          <Input
            id="termStart"
            name="termStart"
            type="date"
            defaultValue={today}
            aria-invalid={Boolean(errors.termStart)}
          />
        </Field>
        <Field id="termEnd" label="Last day of term" error={errors.termEnd}>
          <Input id="termEnd" name="termEnd" type="date" aria-invalid={Boolean(errors.termEnd)} />
        </Field>
      </div>
      <Field
        id="capacity"
        label="Class size limit"
        hint="No more students than this can be enrolled or join."
        error={errors.capacity}
      >
        <Input
          id="capacity"
          name="capacity"
          inputMode="numeric"
          defaultValue="30"
          aria-invalid={Boolean(errors.capacity)}
        />
      </Field>
      <Button type="submit" disabled={!ready || pending} className="self-start">
        {pending ? "Creating…" : "Create classroom"}
      </Button>
    </form>
  );
}
