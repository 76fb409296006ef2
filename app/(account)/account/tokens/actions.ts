"use server";

import { revalidatePath } from "next/cache";

import { countActiveApiTokens, insertApiToken, revokeApiTokenOfUser } from "@/db/queries/api-tokens";
import { generateApiToken } from "@/lib/auth/api-token";
import { requireRole } from "@/lib/auth/session";
import { createApiTokenSchema, revokeApiTokenSchema } from "@/lib/validation/api-token";
import { fieldErrorsFromZod, type FormState } from "@/lib/validation/form-state";

const MAX_ACTIVE_TOKENS = 20;
const TOKEN_ROLES = ["observer", "coordinator", "educator", "admin"] as const;

export type CreateTokenState = FormState & { token?: string; prefix?: string };

/**
 * Server actions read the session cookie only (no request is passed to the
 * guard), so an API token can never mint or revoke tokens.
 */
export async function createApiTokenAction(
  _prev: CreateTokenState,
  form: FormData,
): Promise<CreateTokenState> {
  const user = await requireRole(TOKEN_ROLES);
  // Pick the fields: React adds its own $ACTION_* entries to the form data.
  const parsed = createApiTokenSchema.safeParse({
    name: form.get("name") ?? undefined,
    scope: form.get("scope") ?? undefined,
  });
  if (!parsed.success) return { ok: false, fieldErrors: fieldErrorsFromZod(parsed.error) };
  if ((await countActiveApiTokens({ userId: user.id })) >= MAX_ACTIVE_TOKENS) {
    return {
      ok: false,
      message: `You have ${MAX_ACTIVE_TOKENS} active tokens. Revoke one you no longer use first.`,
    };
  }
  const { token, prefix, tokenHash } = generateApiToken();
  await insertApiToken({
    userId: user.id,
    name: parsed.data.name,
    scope: parsed.data.scope,
    prefix,
    tokenHash,
  });
  revalidatePath("/account/tokens");
  return { ok: true, message: "Token created. Copy it now: it will not be shown again.", token, prefix };
}

export async function revokeApiTokenAction(_prev: FormState, form: FormData): Promise<FormState> {
  const user = await requireRole(TOKEN_ROLES);
  const parsed = revokeApiTokenSchema.safeParse({ tokenId: form.get("tokenId") ?? undefined });
  if (!parsed.success) return { ok: false, message: "That token could not be found." };
  const revoked = await revokeApiTokenOfUser({ userId: user.id, tokenId: parsed.data.tokenId });
  if (!revoked) return { ok: false, message: "That token could not be found, or it was already revoked." };
  revalidatePath("/account/tokens");
  return { ok: true, message: "Token revoked. Scripts that use it now get 401." };
}
