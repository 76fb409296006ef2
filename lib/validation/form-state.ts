import type { z } from "zod";

/** What a server action hands back to its form. */
export type FormState = {
  ok: boolean;
  message?: string;
  fieldErrors?: Record<string, string>;
};

export function fieldErrorsFromZod(error: z.ZodError): Record<string, string> {
  return fieldErrorsFromIssues(error.issues);
}

/**
 * The first message for each field, keyed by its dotted path ("_form" for
 * the whole form), from zod's issues or from an API error's issues (whose
 * path is already dotted text).
 */
export function fieldErrorsFromIssues(
  issues: ReadonlyArray<{ path: ReadonlyArray<PropertyKey> | string; message: string }>,
): Record<string, string> {
  const out: Record<string, string> = {};
  for (const issue of issues) {
    const key = typeof issue.path === "string" ? issue.path : issue.path.map(String).join(".");
    out[key || "_form"] ??= issue.message;
  }
  return out;
}
