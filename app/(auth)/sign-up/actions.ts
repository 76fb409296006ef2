"use server";

import { createObserverAccount } from "@/db/queries/accounts";
import { getUserByEmail } from "@/db/queries/users";
import { hashPassword } from "@/lib/auth/password";
import { signUpSchema } from "@/lib/validation/account";
import { fieldErrorsFromZod, type FormState } from "@/lib/validation/form-state";
import { formFields } from "@/lib/validation/form-data";

export async function signUpAction(_prev: FormState, form: FormData): Promise<FormState> {
  const parsed = signUpSchema.safeParse(formFields(form));
  if (!parsed.success) return { ok: false, fieldErrors: fieldErrorsFromZod(parsed.error) };
  const input = parsed.data;
  if (await getUserByEmail({ email: input.email })) {
    return {
      ok: false,
      fieldErrors: {
        email: "An account with this e-mail address exists. Sign in instead, or reset its password.",
      },
    };
  }
  await createObserverAccount({
    name: input.name,
    email: input.email,
    passwordHash: await hashPassword(input.password),
    country: input.country ?? null,
    timeZone: input.timeZone,
  });
  return { ok: true };
}
