"use server";

import { createHash, randomBytes } from "node:crypto";

import { consumePasswordResetToken, storePasswordResetToken } from "@/db/queries/accounts";
import { getUserByEmail, setUserPassword } from "@/db/queries/users";
import { hashPassword } from "@/lib/auth/password";
import { sendMail } from "@/lib/mail/send";
import { passwordResetMessage } from "@/lib/mail/templates";
import { resetPasswordSchema, resetRequestSchema } from "@/lib/validation/account";
import { fieldErrorsFromZod, type FormState } from "@/lib/validation/form-state";
import { formFields } from "@/lib/validation/form-data";

const RESET_LIFETIME_MS = 60 * 60 * 1000;
const hashToken = (token: string) => createHash("sha256").update(token).digest("hex");

export async function requestResetAction(_prev: FormState, form: FormData): Promise<FormState> {
  const parsed = resetRequestSchema.safeParse(formFields(form));
  if (!parsed.success) return { ok: false, fieldErrors: fieldErrorsFromZod(parsed.error) };
  const user = await getUserByEmail({ email: parsed.data.email });
  if (user && !user.disabledAt && user.email) {
    const token = randomBytes(32).toString("base64url");
    await storePasswordResetToken({
      tokenHash: hashToken(token),
      userId: user.id,
      expiresAt: new Date(Date.now() + RESET_LIFETIME_MS),
    });
    const base = process.env.NEXTAUTH_URL ?? "http://localhost:3000";
    try {
      await sendMail({ to: user.email, ...passwordResetMessage({ url: `${base}/reset-password/${token}` }) });
    } catch {
      return { ok: false, message: "We could not send the e-mail just now. Try again in a few minutes." };
    }
  }
  // The same answer either way, so this form cannot reveal who has an account.
  return {
    ok: true,
    message: `If ${parsed.data.email} has an account, a link to choose a new password is on its way.`,
  };
}

export async function resetPasswordAction(_prev: FormState, form: FormData): Promise<FormState> {
  const parsed = resetPasswordSchema.safeParse(formFields(form));
  if (!parsed.success) return { ok: false, fieldErrors: fieldErrorsFromZod(parsed.error) };
  const claimed = await consumePasswordResetToken({
    tokenHash: hashToken(parsed.data.token),
    now: new Date(),
  });
  if (!claimed)
    return { ok: false, message: "This link has expired or was already used. Ask for a new one." };
  await setUserPassword({ userId: claimed.userId, passwordHash: await hashPassword(parsed.data.password) });
  return { ok: true, message: "Your password is changed. You can sign in with it now." };
}
