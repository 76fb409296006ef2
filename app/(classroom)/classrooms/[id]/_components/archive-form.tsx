"use client";

import { useValidatedAction } from "@/components/classrooms/use-validated-action";
import { Button } from "@/components/ui/button";
import { Field, FormMessage, Input } from "@/components/ui/field";
import { archiveClassroomSchema } from "@/lib/validation/classroom";
import type { FormState } from "@/lib/validation/form-state";

import { archiveClassroomAction } from "../actions";

export function ArchiveForm({ classroomId }: { classroomId: string }) {
  const { state, pending, ready, onSubmit, errors } = useValidatedAction(
    archiveClassroomAction,
    { ok: false } as FormState,
    archiveClassroomSchema,
  );
  return (
    <form onSubmit={onSubmit} noValidate aria-label="Archive classroom" className="flex flex-col gap-3">
      <input type="hidden" name="classroomId" value={classroomId} />
      {state.message ? (
        <FormMessage tone={state.ok ? "success" : "error"}>{state.message}</FormMessage>
      ) : null}
      <p className="text-sm text-ink-700">
        At the end of term, archive the classroom: students can no longer sign in or join, and no sessions can
        be added. You keep every session, count and comparison to read and export.
      </p>
      <Field id="archive-confirm" label="Type archive to confirm" error={errors.confirm}>
        <Input id="archive-confirm" name="confirm" autoComplete="off" className="max-w-40" />
      </Field>
      <Button type="submit" variant="danger" disabled={!ready || pending} className="self-start">
        {pending ? "Archiving…" : "Archive at end of term"}
      </Button>
    </form>
  );
}
