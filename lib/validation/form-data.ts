/**
 * The fields of a submitted form, without the hidden `$ACTION_…` inputs React
 * adds to forms bound to server actions. Strict schemas would otherwise
 * refuse every submission as "unknown field".
 */
export function formFields(form: FormData): Record<string, FormDataEntryValue> {
  const out: Record<string, FormDataEntryValue> = {};
  for (const [key, value] of form.entries()) {
    if (!key.startsWith("$ACTION")) out[key] = value;
  }
  return out;
}
