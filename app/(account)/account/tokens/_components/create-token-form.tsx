"use client";

import { useActionState, useState } from "react";

import { Button } from "@/components/ui/button";
import { Field, FormMessage, Input, Select } from "@/components/ui/field";
import { API_TOKEN_SCOPE_LABELS, API_TOKEN_SCOPES } from "@/lib/validation/api-token";

import { createApiTokenAction, type CreateTokenState } from "../actions";

export function CreateTokenForm() {
  const [state, action, pending] = useActionState<CreateTokenState, FormData>(createApiTokenAction, {
    ok: false,
  });
  const [copied, setCopied] = useState(false);
  return (
    <div className="flex flex-col gap-4">
      <form action={action} className="flex flex-col gap-4" onSubmit={() => setCopied(false)}>
        <Field
          id="token-name"
          label="Name"
          hint="What the token is for, e.g. “weather-station script”."
          error={state.fieldErrors?.name}
        >
          <Input
            id="token-name"
            name="name"
            maxLength={60}
            required
            aria-invalid={Boolean(state.fieldErrors?.name)}
          />
        </Field>
        <Field
          id="token-scope"
          label="May"
          hint="Read only: fetch counts, series and k. Read and submit: also send counts and imports."
          error={state.fieldErrors?.scope}
        >
          <Select id="token-scope" name="scope" defaultValue="read">
            {API_TOKEN_SCOPES.map((scope) => (
              <option key={scope} value={scope}>
                {API_TOKEN_SCOPE_LABELS[scope]}
              </option>
            ))}
          </Select>
        </Field>
        <Button type="submit" disabled={pending}>
          {pending ? "Creating…" : "Create token"}
        </Button>
      </form>
      {state.message && !state.token ? (
        <FormMessage tone={state.ok ? "success" : "error"}>{state.message}</FormMessage>
      ) : null}
      {state.token ? (
        <FormMessage tone="success">
          <p className="font-semibold">{state.message}</p>
          <code
            data-testid="new-token"
            className="mt-2 block rounded bg-white px-2 py-1 font-mono text-xs break-all text-ink-900"
          >
            {state.token}
          </code>
          <button
            type="button"
            className="mt-2 text-sm font-semibold text-corona-700 underline"
            onClick={async () => {
              await navigator.clipboard?.writeText(state.token ?? "");
              setCopied(true);
            }}
          >
            {copied ? "Copied" : "Copy to clipboard"}
          </button>
        </FormMessage>
      ) : null}
    </div>
  );
}
