import "server-only";

import { createHash } from "node:crypto";
import { createWriteStream } from "node:fs";
import { mkdtemp, rm } from "node:fs/promises";
import { tmpdir } from "node:os";
import path from "node:path";
import { Readable, Transform } from "node:stream";
import { pipeline } from "node:stream/promises";

import { AppError } from "@/lib/http/errors";

import { describeTooLarge } from "./sample";

export type SpooledFile = { path: string; bytes: number; sha256: string; remove: () => Promise<void> };

export function tooLargeError({ bytes, maxBytes }: { bytes?: number; maxBytes: number }): AppError {
  return new AppError("payload_too_large", describeTooLarge({ bytes, maxBytes }));
}

/**
 * Copies an upload to a temporary file before anything is parsed, counting
 * and hashing as it goes. The import then reads the copy at disk speed, so a
 * slow connection never keeps the database's write transaction open. A body
 * over the limit is refused by its declared length before a byte is read,
 * and cut off if it lies about it.
 */
export async function spoolRequestBody({
  request,
  maxBytes,
}: {
  request: Request;
  maxBytes: number;
}): Promise<SpooledFile> {
  const declared = Number(request.headers.get("content-length") ?? "NaN");
  if (Number.isFinite(declared) && declared > maxBytes) throw tooLargeError({ bytes: declared, maxBytes });
  if (!request.body || declared === 0) {
    throw new AppError("invalid_input", "The file is empty. Choose the CSV file that holds your logbook.");
  }

  const folder = await mkdtemp(path.join(tmpdir(), "heliotally-import-"));
  const file = path.join(folder, "upload.csv");
  const remove = () => rm(folder, { recursive: true, force: true });
  const hash = createHash("sha256");
  let bytes = 0;
  try {
    await pipeline(
      Readable.fromWeb(request.body as import("node:stream/web").ReadableStream<Uint8Array>),
      new Transform({
        transform(chunk: Buffer, _encoding, done) {
          bytes += chunk.length;
          if (bytes > maxBytes) return done(tooLargeError({ maxBytes }));
          hash.update(chunk);
          done(null, chunk);
        },
      }),
      createWriteStream(file),
    );
  } catch (error) {
    await remove();
    throw error;
  }
  if (bytes === 0) {
    await remove();
    throw new AppError("invalid_input", "The file is empty. Choose the CSV file that holds your logbook.");
  }
  return { path: file, bytes, sha256: hash.digest("hex"), remove };
}
