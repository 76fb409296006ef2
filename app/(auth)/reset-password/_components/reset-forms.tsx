"use client";

import Link from "next/link";
import { useActionState } from "react";

import { Button } from "@/components/ui/button";
import { Field, FormMessage, Input } from "@/components/ui/field";

import { requestResetAction, resetPasswordAction } from "../actions";

const card = "flex flex-col gap-4 rounded-lg border border-ink-100 bg-white p-6 shadow-sm";

export function RequestResetForm() {
  const [state, action, pending] = useActionState(requestResetAction, { ok: false });
  return (
    <form noValidate className={card} action={action}>
      {state.message ? (
        <FormMessage tone={state.ok ? "success" : "error"}>{state.message}</FormMessage>
      ) : null}
      <Field id="email" label="E-mail" error={state.fieldErrors?.email}>
        <Input
          id="email"
          name="email"
          type="email"
          autoComplete="email"
          aria-invalid={Boolean(state.fieldErrors?.email)}
        />
      </Field>
      <Button type="submit" disabled={pending}>
        {pending ? "Sending…" : "E-mail me a link"}
      </Button>
    </form>
  );
}

export function NewPasswordForm({ token }: { token: string }) {
  const [state, action, pending] = useActionState(resetPasswordAction, { ok: false });
  const errors = state.fieldErrors ?? {};
  return (
    <form noValidate className={card} action={action}>
      {state.message ? (
        <FormMessage tone={state.ok ? "success" : "error"}>{state.message}</FormMessage>
      ) : null}
      {errors.token ? <FormMessage tone="error">{errors.token}</FormMessage> : null}
      <input type="hidden" name="token" value={token} />
      <Field id="password" label="New password" hint="At least 10 characters." error={errors.password}>
        <Input
          id="password"
          name="password"
          type="password"
          autoComplete="new-password"
          aria-invalid={Boolean(errors.password)}
        />
      </Field>
      <Field id="confirmPassword" label="New password again" error={errors.confirmPassword}>
        <Input
          id="confirmPassword"
          name="confirmPassword"
          type="password"
          autoComplete="new-password"
          aria-invalid={Boolean(errors.confirmPassword)}
        />
      </Field>
      <Button type="submit" disabled={pending || state.ok}>
        {pending ? "Saving…" : "Save new password"}
      </Button>
      {state.ok ? (
        <Link href="/sign-in" className="text-center font-semibold text-corona-700 underline">
          Go to sign-in
        </Link>
      ) : null}
    </form>
  );
}
