"use client";

import { startTransition, useActionState, useEffect, useState, type FormEvent } from "react";
import type { z } from "zod";

import { fieldErrorsFromZod, type FormState } from "@/lib/validation/form-state";

/**
 * A server action behind a form, checked first with the same zod schema the
 * server uses. The form is submitted by hand rather than through its
 * `action` attribute: React resets a form after an action runs, which would
 * wipe what the user typed whenever the server (or this check) refuses it.
 * Until the page is interactive `ready` is false: forms keep their submit
 * button disabled so the browser cannot send them natively (as a GET, with
 * the values in the address bar) before this handler exists.
 */
export function useValidatedAction<S extends FormState>(
  action: (state: S, form: FormData) => Promise<S>,
  initial: S,
  schema?: z.ZodType,
) {
  const [state, dispatch, pending] = useActionState<S, FormData>(
    action as (state: Awaited<S>, form: FormData) => Promise<S>,
    initial as Awaited<S>,
  );
  const [clientErrors, setClientErrors] = useState<Record<string, string>>({});
  const ready = useHydrated();
  const onSubmit = (event: FormEvent<HTMLFormElement>) => {
    event.preventDefault();
    const data = new FormData(event.currentTarget);
    if (schema) {
      const parsed = schema.safeParse(Object.fromEntries(data));
      if (!parsed.success) {
        setClientErrors(fieldErrorsFromZod(parsed.error));
        return;
      }
    }
    setClientErrors({});
    startTransition(() => dispatch(data));
  };
  return {
    state: state as S,
    pending,
    ready,
    onSubmit,
    errors: { ...state.fieldErrors, ...clientErrors } as Record<string, string | undefined>,
  };
}

/** False during server rendering and hydration, true once the page responds to input. */
export function useHydrated(): boolean {
  const [hydrated, setHydrated] = useState(false);
  // eslint-disable-next-line react-hooks/set-state-in-effect
  useEffect(() => setHydrated(true), []);
  return hydrated;
}
