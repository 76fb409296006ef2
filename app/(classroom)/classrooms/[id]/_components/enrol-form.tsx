"use client";

import { useRouter } from "next/navigation";
import { useEffect } from "react";

import { useValidatedAction } from "@/components/classrooms/use-validated-action";
import { Button } from "@/components/ui/button";
import { Field, FormMessage, TextArea } from "@/components/ui/field";
import { enrolStudentsSchema, MAX_ENROL_AT_ONCE } from "@/lib/validation/classroom";

import { enrolStudentsAction, type EnrolState } from "../actions";
import { rememberIssuedPins } from "./card-store";

export function EnrolForm({ classroomId, free }: { classroomId: string; free: number }) {
  const router = useRouter();
  const { state, pending, ready, onSubmit, errors } = useValidatedAction(
    enrolStudentsAction,
    { ok: false } as EnrolState,
    enrolStudentsSchema,
  );

  useEffect(() => {
    if (!state.ok || !state.issued) return;
    rememberIssuedPins(classroomId, state.issued);
    router.push(`/classrooms/${classroomId}/cards`);
  }, [state, classroomId, router]);

  return (
    <form noValidate aria-label="Enrol students" onSubmit={onSubmit} className="flex flex-col gap-3">
      <input type="hidden" name="classroomId" value={classroomId} />
      {state.message && !state.ok ? <FormMessage tone="error">{state.message}</FormMessage> : null}
      <Field
        id="displayNames"
        label="Students to enrol, one per line"
        hint={`Display names only, e.g. “Ava P.”: a first name and an initial. No e-mail addresses. Room for ${free} more; up to ${MAX_ENROL_AT_ONCE} at a time.`}
        error={
          errors.displayNames ?? Object.entries(errors).find(([k]) => k.startsWith("displayNames."))?.[1]
        }
      >
        <TextArea
          id="displayNames"
          name="displayNames"
          rows={4}
          aria-invalid={Boolean(errors.displayNames)}
        />
      </Field>
      <Button type="submit" disabled={!ready || pending || free === 0} className="self-start">
        {pending ? "Enrolling…" : "Enrol and make sign-in cards"}
      </Button>
    </form>
  );
}
