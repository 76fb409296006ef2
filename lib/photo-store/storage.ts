import "server-only";

import { UTFile } from "uploadthing/server";

import { AppError } from "@/lib/http/errors";

import { getUtApi } from "./config";

/** How long a signed link to a private photo stays valid. Short: the app hands out a new one each time. */
export const SIGNED_URL_TTL_S = 300;

export const STORAGE_DOWN_MESSAGE =
  "The photo store is not answering just now. Your count is kept; add the photo again in a few minutes.";

/** A short-lived signed link to a private file (made locally by the SDK, no request). */
export async function signFileUrl({
  key,
  expiresInS = SIGNED_URL_TTL_S,
}: {
  key: string;
  expiresInS?: number;
}): Promise<string> {
  const { ufsUrl } = await getUtApi().generateSignedURL(key, { expiresIn: expiresInS });
  return ufsUrl;
}

/** The stored bytes of a file, through a signed link. Throws AppError("unavailable") when storage cannot be read. */
export async function readStoredFile({
  key,
  maxBytes,
}: {
  key: string;
  maxBytes: number;
}): Promise<Uint8Array> {
  let response: Response;
  try {
    response = await fetch(await signFileUrl({ key, expiresInS: 60 }), {
      signal: AbortSignal.timeout(30_000),
    });
  } catch {
    throw new AppError("unavailable", STORAGE_DOWN_MESSAGE);
  }
  if (!response.ok)
    throw new AppError("unavailable", `The photo store answered ${response.status} for a stored photo.`);
  const length = Number(response.headers.get("content-length") ?? "0");
  if (length > maxBytes)
    throw new AppError("payload_too_large", "The stored photo is larger than the limit.");
  const bytes = new Uint8Array(await response.arrayBuffer());
  if (bytes.byteLength > maxBytes)
    throw new AppError("payload_too_large", "The stored photo is larger than the limit.");
  return bytes;
}

/** Stores a server-made file (the thumbnail) privately; returns its key. */
export async function storeServerFile({
  bytes,
  name,
  type,
}: {
  bytes: Buffer;
  name: string;
  type: string;
}): Promise<string> {
  const result = await getUtApi().uploadFiles(new UTFile([new Uint8Array(bytes)], name, { type }), {
    acl: "private",
  });
  if (result.error || !result.data)
    throw new AppError("unavailable", result.error?.message ?? STORAGE_DOWN_MESSAGE);
  return result.data.key;
}

/** Deletes files; throws AppError("unavailable") when the store cannot be reached, so nothing is forgotten half-way. */
export async function deleteStoredFiles({ keys }: { keys: string[] }): Promise<void> {
  if (keys.length === 0) return;
  try {
    const result = await getUtApi().deleteFiles(keys);
    if (!result.success) throw new Error("deleteFiles reported failure");
  } catch {
    throw new AppError(
      "unavailable",
      "The photo store is not answering, so the photo files could not be deleted. Nothing was deleted; try again in a few minutes.",
    );
  }
}

/** Whether the configured store answers at all (any HTTP answer counts). */
export async function isStorageReachable({ url }: { url: string }): Promise<boolean> {
  try {
    await fetch(url, { method: "GET", signal: AbortSignal.timeout(2_500) });
    return true;
  } catch {
    return false;
  }
}
