"use client";

import { signIn } from "next-auth/react";
import { useRouter } from "next/navigation";
import { useState } from "react";

import { useHydrated } from "@/components/classrooms/use-validated-action";
import { Button } from "@/components/ui/button";
import { Field, FormMessage, Input } from "@/components/ui/field";
import { credentialsSchema, signInLinkSchema } from "@/lib/validation/account";

type Errors = Partial<Record<"email" | "password", string>>;

export function SignInForm({ callbackUrl, initialError }: { callbackUrl?: string; initialError?: string }) {
  const router = useRouter();
  const [errors, setErrors] = useState<Errors>({});
  const [message, setMessage] = useState<{ tone: "error" | "success"; text: string } | null>(
    initialError ? { tone: "error", text: initialError } : null,
  );
  const [busy, setBusy] = useState(false);
  // A click before the page has hydrated would submit the form to nowhere
  // and do nothing; the buttons wait until the handlers exist.
  const ready = useHydrated();
  // Only same-site paths are followed after sign-in.
  const target =
    callbackUrl && callbackUrl.startsWith("/") && !callbackUrl.startsWith("//") ? callbackUrl : "/";

  async function onPassword(form: FormData) {
    const parsed = credentialsSchema.safeParse(Object.fromEntries(form));
    if (!parsed.success) {
      setErrors(Object.fromEntries(parsed.error.issues.map((i) => [i.path[0], i.message])));
      return;
    }
    setErrors({});
    setBusy(true);
    const result = await signIn("credentials", { ...parsed.data, redirect: false });
    setBusy(false);
    if (!result || result.error) {
      setMessage({ tone: "error", text: result?.error ?? "Sign-in failed. Try again." });
      return;
    }
    router.push(target);
    router.refresh();
  }

  async function onLink(form: FormData) {
    const parsed = signInLinkSchema.safeParse({ email: form.get("email") });
    if (!parsed.success) {
      setErrors({ email: parsed.error.issues[0]?.message });
      return;
    }
    setErrors({});
    setBusy(true);
    const result = await signIn("email", { email: parsed.data.email, redirect: false, callbackUrl: target });
    setBusy(false);
    setMessage(
      result?.error
        ? {
            tone: "error",
            text: "We could not send a sign-in link just now. Try again, or use your password.",
          }
        : {
            tone: "success",
            text: `If ${parsed.data.email} has an account, a sign-in link is on its way. It works once, for 24 hours.`,
          },
    );
  }

  return (
    <form
      noValidate
      className="flex flex-col gap-4 rounded-lg border border-ink-100 bg-white p-6 shadow-sm"
      action={onPassword}
    >
      {message ? <FormMessage tone={message.tone}>{message.text}</FormMessage> : null}
      <Field id="email" label="E-mail" error={errors.email}>
        <Input
          id="email"
          name="email"
          type="email"
          autoComplete="email"
          aria-invalid={Boolean(errors.email)}
        />
      </Field>
      <Field id="password" label="Password" error={errors.password}>
        <Input
          id="password"
          name="password"
          type="password"
          autoComplete="current-password"
          aria-invalid={Boolean(errors.password)}
        />
      </Field>
      <Button type="submit" disabled={busy || !ready}>
        {busy ? "Signing in…" : "Sign in"}
      </Button>
      <div className="flex items-center gap-3 text-xs text-ink-400">
        <span className="h-px flex-1 bg-ink-100" /> or <span className="h-px flex-1 bg-ink-100" />
      </div>
      <Button type="submit" variant="secondary" formAction={onLink} disabled={busy || !ready}>
        E-mail me a sign-in link
      </Button>
    </form>
  );
}
