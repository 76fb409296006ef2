import { z } from "zod";

/** The same list as api_tokens.scope in db/schema.ts (kept here so forms need not load the schema). */
export const API_TOKEN_SCOPES = ["read", "read-submit"] as const;
export type ApiTokenScope = (typeof API_TOKEN_SCOPES)[number];

export const API_TOKEN_SCOPE_LABELS: Record<ApiTokenScope, string> = {
  read: "Read only",
  "read-submit": "Read and submit",
};

/** The form on Account → API tokens. */
export const createApiTokenSchema = z.strictObject({
  name: z
    .string({ error: "Give the token a name." })
    .trim()
    .min(1, { error: "Give the token a name, e.g. “station script”." })
    .max(60, { error: "The name can be at most 60 characters." }),
  scope: z.enum(API_TOKEN_SCOPES, { error: "Choose what the token may do." }),
});

export const revokeApiTokenSchema = z.strictObject({
  tokenId: z.string().trim().min(1).max(64),
});
