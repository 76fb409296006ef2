/**
 * UPLOADTHING_TOKEN helpers. The SDK decodes the token as padded standard
 * base64 of `{ apiKey, appId, regions, ingestHost? }` and refuses it unless
 * `apiKey` starts with `sk_` and `regions` is non-empty
 * (uploadthing 7.7.4, dist/shared-schemas: `ParsedToken`). The apiKey is the
 * HMAC secret for every signature on both sides.
 */

export type UploadthingToken = {
  apiKey: string;
  appId: string;
  regions: string[];
  ingestHost?: string;
};

/** Development-only credentials; they protect nothing but the local fake. */
export const LOCAL_API_KEY = "sk_local_heliotally_dev_5f3a9c2e7b1d4068";
export const LOCAL_APP_ID = "heliotally-local";

/** `makeLocalToken({ apiKey: LOCAL_API_KEY, appId: LOCAL_APP_ID })`, spelled out so it can be pasted into an env file. */
export const LOCAL_UPLOADTHING_TOKEN =
  "eyJhcGlLZXkiOiJza19sb2NhbF9oZWxpb3RhbGx5X2Rldl81ZjNhOWMyZTdiMWQ0MDY4IiwiYXBwSWQiOiJoZWxpb3RhbGx5LWxvY2FsIiwicmVnaW9ucyI6WyJsb2NhbCJdfQ==";

export function makeLocalToken({ apiKey, appId }: { apiKey: string; appId: string }): string {
  if (!apiKey.startsWith("sk_"))
    throw new Error("apiKey must start with sk_ (the SDK refuses anything else)");
  if (!appId) throw new Error("appId must not be empty");
  const payload: UploadthingToken = { apiKey, appId, regions: ["local"] };
  return Buffer.from(JSON.stringify(payload), "utf8").toString("base64");
}

/** Decodes and checks a token the way the SDK does; throws with a readable message otherwise. */
export function parseToken(token: string): UploadthingToken {
  let parsed: unknown;
  try {
    parsed = JSON.parse(Buffer.from(token.trim(), "base64").toString("utf8"));
  } catch {
    throw new Error("UPLOADTHING_TOKEN is not base64 of a JSON object");
  }
  if (typeof parsed !== "object" || parsed === null)
    throw new Error("UPLOADTHING_TOKEN is not a JSON object");
  const { apiKey, appId, regions, ingestHost } = parsed as Record<string, unknown>;
  if (typeof apiKey !== "string" || !apiKey.startsWith("sk_")) {
    throw new Error("UPLOADTHING_TOKEN: apiKey must be a string starting with sk_");
  }
  if (typeof appId !== "string" || appId === "")
    throw new Error("UPLOADTHING_TOKEN: appId must be a non-empty string");
  if (!Array.isArray(regions) || regions.length === 0 || !regions.every((r) => typeof r === "string")) {
    throw new Error("UPLOADTHING_TOKEN: regions must be a non-empty array of strings");
  }
  if (ingestHost !== undefined && typeof ingestHost !== "string") {
    throw new Error("UPLOADTHING_TOKEN: ingestHost must be a string when present");
  }
  return { apiKey, appId, regions: regions as string[], ...(ingestHost !== undefined ? { ingestHost } : {}) };
}
