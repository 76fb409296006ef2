import { AppError } from "@/lib/http/errors";
import type { FormState } from "@/lib/validation/form-state";

/**
 * A refusal from the classroom domain, as a server action hands it back to
 * its form: the message above the form, field messages beside the fields.
 * Anything that is not a refusal (a bug, a lost database) is thrown on.
 */
export function toFormState(error: unknown): FormState {
  if (error instanceof AppError && error.status < 500) {
    return {
      ok: false,
      message: error.message,
      fieldErrors: Object.fromEntries(
        (error.issues ?? []).map((issue) => [issue.path || "_form", issue.message]),
      ),
    };
  }
  throw error;
}
