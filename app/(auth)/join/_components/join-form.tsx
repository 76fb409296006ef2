"use client";

import { signIn } from "next-auth/react";
import { useRouter } from "next/navigation";
import { useState } from "react";

import { useValidatedAction } from "@/components/classrooms/use-validated-action";
import { Button } from "@/components/ui/button";
import { Field, FormMessage, Input } from "@/components/ui/field";
import { joinClassroomSchema } from "@/lib/validation/classroom";

import { joinClassroomAction, type JoinState } from "../actions";

export function JoinForm({ initialCode = "" }: { initialCode?: string }) {
  const router = useRouter();
  const { state, pending, ready, onSubmit, errors } = useValidatedAction(
    joinClassroomAction,
    { ok: false } as JoinState,
    joinClassroomSchema,
  );
  const [signing, setSigning] = useState(false);
  const [signInError, setSignInError] = useState<string | null>(null);

  if (state.ok && state.card) {
    const card = state.card;
    return (
      <div className="flex flex-col gap-4 rounded-lg border border-meadow-200 bg-meadow-50 p-6" role="status">
        <p className="text-sm font-semibold tracking-wide text-meadow-700 uppercase">
          You have joined {card.classroomName}
        </p>
        <p className="text-sm text-ink-700">
          Write these down or tell your teacher: you need them every time you sign in.
        </p>
        <dl className="grid grid-cols-[8rem_1fr] gap-y-1 text-lg">
          <dt className="text-ink-600">Classroom code</dt>
          <dd className="font-mono font-semibold">{card.code}</dd>
          <dt className="text-ink-600">Your name</dt>
          <dd className="font-semibold">{card.displayName}</dd>
          <dt className="text-ink-600">Your PIN</dt>
          <dd className="font-mono text-2xl font-semibold" data-testid="joined-pin">
            {card.pin}
          </dd>
        </dl>
        {signInError ? <FormMessage tone="error">{signInError}</FormMessage> : null}
        <Button
          type="button"
          disabled={signing}
          className="self-start"
          onClick={async () => {
            setSigning(true);
            const result = await signIn("classroom", {
              code: card.code,
              displayName: card.displayName,
              pin: card.pin,
              redirect: false,
            });
            setSigning(false);
            if (!result || result.error)
              return setSignInError(result?.error ?? "Sign-in failed. Try the sign-in page.");
            router.push("/class");
            router.refresh();
          }}
        >
          {signing ? "Signing in…" : "I have written it down: sign me in"}
        </Button>
      </div>
    );
  }

  return (
    <form
      noValidate
      onSubmit={onSubmit}
      className="flex flex-col gap-4 rounded-lg border border-ink-100 bg-white p-6 shadow-sm"
    >
      {state.message ? <FormMessage tone="error">{state.message}</FormMessage> : null}
      <Field
        id="join-code"
        label="Classroom code"
        hint="Your teacher shows it on the board, e.g. SUN-7KQ4."
        error={errors.code}
      >
        <Input
          id="join-code"
          name="code"
          defaultValue={initialCode}
          autoComplete="off"
          aria-invalid={Boolean(errors.code)}
        />
      </Field>
      <Field
        id="join-name"
        label="Your name in the class"
        hint="Your first name and the first letter of your family name, e.g. Sam T. Not your e-mail address."
        error={errors.displayName}
      >
        <Input
          id="join-name"
          name="displayName"
          autoComplete="off"
          aria-invalid={Boolean(errors.displayName)}
        />
      </Field>
      <Button type="submit" disabled={!ready || pending} className="self-start">
        {pending ? "Joining…" : "Join the class"}
      </Button>
    </form>
  );
}
