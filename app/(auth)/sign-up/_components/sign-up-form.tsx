"use client";

import { signIn } from "next-auth/react";
import { useRouter } from "next/navigation";
import { useActionState, useEffect, useRef, useState } from "react";

import { Button } from "@/components/ui/button";
import { Field, FormMessage, Input } from "@/components/ui/field";
import { signUpSchema } from "@/lib/validation/account";
import { formFields } from "@/lib/validation/form-data";
import { fieldErrorsFromZod, type FormState } from "@/lib/validation/form-state";

import { signUpAction } from "../actions";

export function SignUpForm() {
  const router = useRouter();
  const [state, action, pending] = useActionState(signUpAction, { ok: false });
  const [clientErrors, setClientErrors] = useState<Record<string, string>>({});
  const credentials = useRef<{ email: string; password: string } | null>(null);
  const timeZoneInput = useRef<HTMLInputElement>(null);

  // The browser knows the visitor's time zone; the server does not.
  useEffect(() => {
    if (timeZoneInput.current && !timeZoneInput.current.value) {
      timeZoneInput.current.value = Intl.DateTimeFormat().resolvedOptions().timeZone || "UTC";
    }
  }, []);

  useEffect(() => {
    if (!state.ok || !credentials.current) return;
    void signIn("credentials", { ...credentials.current, redirect: false }).then(() => {
      router.push("/logbook");
      router.refresh();
    });
  }, [state.ok, router]);

  const errors: FormState["fieldErrors"] = { ...state.fieldErrors, ...clientErrors };

  return (
    <form
      noValidate
      className="flex flex-col gap-4 rounded-lg border border-ink-100 bg-white p-6 shadow-sm"
      action={action}
      onSubmit={(event) => {
        const data = formFields(new FormData(event.currentTarget));
        const parsed = signUpSchema.safeParse(data);
        if (!parsed.success) {
          event.preventDefault();
          setClientErrors(fieldErrorsFromZod(parsed.error));
          return;
        }
        setClientErrors({});
        credentials.current = { email: parsed.data.email, password: parsed.data.password };
      }}
    >
      {state.message ? (
        <FormMessage tone={state.ok ? "success" : "error"}>{state.message}</FormMessage>
      ) : null}
      {state.ok ? <FormMessage tone="success">Welcome! Opening your Logbook…</FormMessage> : null}
      {errors?._form ? <FormMessage tone="error">{errors._form}</FormMessage> : null}
      <Field id="name" label="Name shown to your network" error={errors?.name}>
        <Input id="name" name="name" autoComplete="name" aria-invalid={Boolean(errors?.name)} />
      </Field>
      <Field id="email" label="E-mail" error={errors?.email}>
        <Input
          id="email"
          name="email"
          type="email"
          autoComplete="email"
          aria-invalid={Boolean(errors?.email)}
        />
      </Field>
      <Field id="password" label="Password" hint="At least 10 characters." error={errors?.password}>
        <Input
          id="password"
          name="password"
          type="password"
          autoComplete="new-password"
          aria-invalid={Boolean(errors?.password)}
        />
      </Field>
      <Field id="confirmPassword" label="Password again" error={errors?.confirmPassword}>
        <Input
          id="confirmPassword"
          name="confirmPassword"
          type="password"
          autoComplete="new-password"
          aria-invalid={Boolean(errors?.confirmPassword)}
        />
      </Field>
      <Field id="country" label="Country (two-letter code, optional)" error={errors?.country}>
        <Input
          id="country"
          name="country"
          maxLength={2}
          className="w-24 uppercase"
          aria-invalid={Boolean(errors?.country)}
        />
      </Field>
      <Field
        id="timeZone"
        label="Time zone"
        hint="Used to show your local time beside UT."
        error={errors?.timeZone}
      >
        <Input id="timeZone" name="timeZone" ref={timeZoneInput} aria-invalid={Boolean(errors?.timeZone)} />
      </Field>
      <Button type="submit" disabled={pending || state.ok}>
        {pending ? "Creating your account…" : "Create my account"}
      </Button>
    </form>
  );
}
