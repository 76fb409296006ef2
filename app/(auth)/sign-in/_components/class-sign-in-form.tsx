"use client";

import { signIn, signOut } from "next-auth/react";
import { useRouter } from "next/navigation";
import { useEffect, useState, type FormEvent } from "react";

import { useHydrated } from "@/components/classrooms/use-validated-action";
import { Button } from "@/components/ui/button";
import { Field, FormMessage, Input } from "@/components/ui/field";
import { classroomSignInSchema } from "@/lib/validation/classroom";

type Errors = Partial<Record<"code" | "displayName" | "pin", string>>;

/** Where a shared class device remembers its classroom code (never a name or PIN). */
export const SHARED_DEVICE_KEY = "heliotally.sharedClassDevice";

/**
 * Students sign in with the classroom code, their display name and their PIN.
 * On a shared class device the code is remembered and whoever was signed in
 * before is signed out first, so a failed attempt never leaves the previous
 * student's session open for the next one.
 */
export function ClassSignInForm({
  sharedDevice = false,
  initialCode = "",
}: {
  sharedDevice?: boolean;
  initialCode?: string;
}) {
  const router = useRouter();
  const [code, setCode] = useState(initialCode);
  const [errors, setErrors] = useState<Errors>({});
  const [message, setMessage] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  // No native submission (PIN in the address bar) before the handler exists.
  const ready = useHydrated();

  useEffect(() => {
    if (!sharedDevice || initialCode) return;
    const remembered = window.localStorage.getItem(SHARED_DEVICE_KEY);
    // Reading the device's remembered code once, after hydration.
    // eslint-disable-next-line react-hooks/set-state-in-effect
    if (remembered) setCode(remembered);
  }, [sharedDevice, initialCode]);

  // Submitted by hand: a form `action` would clear the name after a refused attempt.
  async function onSubmit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const form = new FormData(event.currentTarget);
    setMessage(null);
    const parsed = classroomSignInSchema.safeParse({
      code,
      displayName: form.get("displayName"),
      pin: form.get("pin"),
    });
    if (!parsed.success) {
      setErrors(Object.fromEntries(parsed.error.issues.map((i) => [i.path[0], i.message])));
      return;
    }
    setErrors({});
    setBusy(true);
    try {
      if (sharedDevice) {
        await signOut({ redirect: false });
        window.localStorage.setItem(SHARED_DEVICE_KEY, parsed.data.code);
      }
      const result = await signIn("classroom", { ...parsed.data, redirect: false });
      if (!result || result.error) {
        setMessage(result?.error ?? "Sign-in failed. Try again.");
        return;
      }
      router.push("/class");
      router.refresh();
    } catch {
      setMessage("No connection to Heliotally. Try again in a moment.");
    } finally {
      setBusy(false);
    }
  }

  return (
    <form noValidate onSubmit={onSubmit} className="flex flex-col gap-4" aria-label="Student sign-in">
      {message ? <FormMessage tone="error">{message}</FormMessage> : null}
      <Field
        id="class-code"
        label="Classroom code"
        hint="On your sign-in card, e.g. SUN-7KQ4."
        error={errors.code}
      >
        <Input
          id="class-code"
          name="code"
          autoComplete="off"
          autoCapitalize="characters"
          value={code}
          onChange={(e) => setCode(e.target.value)}
          aria-invalid={Boolean(errors.code)}
        />
      </Field>
      <Field
        id="class-name"
        label="Your name"
        hint="Exactly as on your card, e.g. Ava P."
        error={errors.displayName}
      >
        <Input
          id="class-name"
          name="displayName"
          autoComplete="off"
          aria-invalid={Boolean(errors.displayName)}
        />
      </Field>
      <Field id="class-pin" label="PIN" error={errors.pin}>
        <Input
          id="class-pin"
          name="pin"
          type="password"
          inputMode="numeric"
          autoComplete="off"
          maxLength={8}
          aria-invalid={Boolean(errors.pin)}
        />
      </Field>
      <Button type="submit" disabled={busy || !ready}>
        {busy ? "Signing in…" : "Sign in to my class"}
      </Button>
    </form>
  );
}
