"use client";

import { useValidatedAction } from "@/components/classrooms/use-validated-action";
import { Button } from "@/components/ui/button";
import { Field, FormMessage, Input } from "@/components/ui/field";
import { classroomSettingsSchema } from "@/lib/validation/classroom";
import type { FormState } from "@/lib/validation/form-state";

import { updateSettingsAction } from "../actions";

export function SettingsForm({
  classroom,
}: {
  classroom: {
    id: string;
    joinOpen: boolean;
    compareWithOthers: boolean;
    capacity: number;
    joinCode: string;
  };
}) {
  const { state, pending, ready, onSubmit, errors } = useValidatedAction(
    updateSettingsAction,
    { ok: false } as FormState,
    classroomSettingsSchema,
  );
  return (
    <form onSubmit={onSubmit} noValidate aria-label="Classroom settings" className="flex flex-col gap-4">
      <input type="hidden" name="classroomId" value={classroom.id} />
      {state.message ? (
        <FormMessage tone={state.ok ? "success" : "error"}>{state.message}</FormMessage>
      ) : null}
      <label className="flex items-start gap-2 text-sm text-ink-800">
        <input
          type="checkbox"
          name="joinOpen"
          defaultChecked={classroom.joinOpen}
          className="mt-0.5 size-4 accent-corona-600"
        />
        <span>
          <strong>Students may join with the code</strong> {classroom.joinCode} at /join, up to the class size
          limit. Close it again once everyone is in.
        </span>
      </label>
      <label className="flex items-start gap-2 text-sm text-ink-800">
        <input
          type="checkbox"
          name="compareWithOthers"
          defaultChecked={classroom.compareWithOthers}
          className="mt-0.5 size-4 accent-corona-600"
        />
        <span>
          <strong>Compare this class with other classes.</strong> Educators who also opt in see this
          class&apos;s name, school, median per session day and class k. Student names never leave the
          classroom.
        </span>
      </label>
      <Field id="settings-capacity" label="Class size limit" error={errors.capacity}>
        <Input
          id="settings-capacity"
          name="capacity"
          inputMode="numeric"
          defaultValue={String(classroom.capacity)}
          className="max-w-28"
        />
      </Field>
      <Button type="submit" variant="secondary" disabled={!ready || pending} className="self-start">
        {pending ? "Saving…" : "Save settings"}
      </Button>
    </form>
  );
}
