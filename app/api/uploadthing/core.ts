import { createUploadthing, type FileRouter } from "uploadthing/next";
import { UploadThingError } from "uploadthing/server";
import { z } from "zod";

import { getObservationOfObserver } from "@/db/queries/observations";
import { deletePhotoRow, insertPhoto } from "@/db/queries/photos";
import { requireObserver } from "@/lib/auth/session";
import { getUploadthingEnv } from "@/lib/env";
import { AppError } from "@/lib/http/errors";
import { MAX_PHOTO_BYTES, formatMegabytes } from "@/lib/photo/limits";
import { inspectPhotoBytes } from "@/lib/photo-store/inspect";
import {
  deleteStoredFiles,
  isStorageReachable,
  readStoredFile,
  storeServerFile,
  STORAGE_DOWN_MESSAGE,
} from "@/lib/photo-store/storage";

const f = createUploadthing();

/** What the uploader sends with the file: the observation the photo belongs to (their own). */
export const photoUploadInputSchema = z.object({
  observationId: z.string().min(1).max(64),
});

/** What the browser learns when the upload finishes: the stored photo, or why it was refused (and deleted). */
export type PhotoUploadResult =
  | { ok: true; photoId: string; widthPx: number; heightPx: number; exifTakenAt: string | null }
  | { ok: false; message: string };

// The SDK's size limits come in powers of two; 32MB here, and our own 25 MB rule is checked on the declared size
// in the middleware and on the stored bytes after the upload.
const IMAGE_RULE = { maxFileSize: "32MB", maxFileCount: 1, acl: "private" } as const;

export const photoRouter = {
  observationPhoto: f(
    { "image/jpeg": IMAGE_RULE, "image/png": IMAGE_RULE, "image/webp": IMAGE_RULE, "image/tiff": IMAGE_RULE },
    { awaitServerData: true },
  )
    .input(photoUploadInputSchema)
    .middleware(async ({ req, input, files }) => {
      const caller = await guardUploader(req);
      const observation = await getObservationOfObserver({
        observerId: caller.observer.id,
        observationId: input.observationId,
      });
      if (!observation)
        throw new UploadThingError({ code: "NOT_FOUND", message: "No such observation in your Logbook." });
      const tooBig = files.find((file) => file.size > MAX_PHOTO_BYTES);
      if (tooBig) {
        throw new UploadThingError({
          code: "TOO_LARGE",
          message: `The photo is ${formatMegabytes(tooBig.size)}; the limit is ${formatMegabytes(MAX_PHOTO_BYTES)}.`,
        });
      }
      // With a configured (local) store, find out now rather than after the browser has sent 25 MB.
      const { ingestUrl } = getUploadthingEnv();
      if (ingestUrl && !(await isStorageReachable({ url: ingestUrl }))) {
        throw new UploadThingError({ code: "INTERNAL_SERVER_ERROR", message: STORAGE_DOWN_MESSAGE });
      }
      return {
        observerId: caller.observer.id,
        uploaderUserId: caller.user.id,
        observationId: observation.id,
        timeZone: caller.observer.timeZone,
      };
    })
    .onUploadError(({ error, fileKey }) => {
      console.warn(`Photo upload ${fileKey} failed at the store: ${error.message}`);
    })
    .onUploadComplete(async ({ file, metadata }): Promise<PhotoUploadResult> => {
      // Never throw here: the SDK would then send no result, and the browser would wait for one in vain.
      try {
        return await storeCheckedPhoto({ file, metadata });
      } catch (error) {
        console.error("Photo upload could not be completed", error);
        await deleteStoredFiles({ keys: [file.key] }).catch(() => {});
        return {
          ok: false,
          message:
            error instanceof AppError ? error.message : "The photo could not be stored. Please try again.",
        };
      }
    }),
} satisfies FileRouter;

export type PhotoRouter = typeof photoRouter;

/** The app's one guard, its AppError turned into the SDK's error so the uploader sees our words. */
async function guardUploader(req: Request) {
  try {
    return await requireObserver(undefined, { request: req });
  } catch (error) {
    if (error instanceof AppError) {
      const message =
        error.code === "unauthenticated"
          ? "Sign in to add photos."
          : "Only observers and students can add photos.";
      throw new UploadThingError({ code: "FORBIDDEN", message });
    }
    throw error;
  }
}

/**
 * The content checks the SDK cannot do (it only sees the declared type and
 * size): fetch the stored bytes back, check them, make the thumbnail, store
 * the row. A refused file is deleted from the store before answering.
 */
async function storeCheckedPhoto({
  file,
  metadata,
}: {
  file: { key: string; name: string; size: number; ufsUrl: string };
  metadata: { observerId: string; observationId: string; timeZone: string };
}): Promise<PhotoUploadResult> {
  const bytes = await readStoredFile({ key: file.key, maxBytes: MAX_PHOTO_BYTES });
  const inspected = await inspectPhotoBytes({ bytes, timeZone: metadata.timeZone });
  if (!inspected.ok) {
    await deleteStoredFiles({ keys: [file.key] });
    return { ok: false, message: inspected.message };
  }
  const thumbnailKey = await storeServerFile({
    bytes: inspected.thumbnail,
    name: `thumbnail-${file.key}.webp`,
    type: "image/webp",
  });
  let photo;
  try {
    photo = await insertPhoto({
      fileKey: file.key,
      observerId: metadata.observerId,
      observationId: metadata.observationId,
      name: file.name.slice(0, 200),
      sizeBytes: bytes.byteLength,
      mimeType: inspected.mimeType,
      widthPx: inspected.widthPx,
      heightPx: inspected.heightPx,
      url: file.ufsUrl,
      thumbnailKey,
      exifTakenAt: inspected.exifTakenAt,
    });
  } catch (error) {
    await deleteStoredFiles({ keys: [file.key, thumbnailKey] }).catch(() => {});
    throw error;
  }
  // The observation may have been deleted while the photo was on its way: keep nothing for it then.
  const stillThere = await getObservationOfObserver({
    observerId: metadata.observerId,
    observationId: metadata.observationId,
  });
  if (!stillThere) {
    await deletePhotoRow({ photoId: photo.id });
    await deleteStoredFiles({ keys: [file.key, thumbnailKey] });
    return {
      ok: false,
      message: "The observation was deleted while its photo was uploading; nothing was kept.",
    };
  }
  return {
    ok: true,
    photoId: photo.id,
    widthPx: inspected.widthPx,
    heightPx: inspected.heightPx,
    exifTakenAt: inspected.exifTakenAt ? inspected.exifTakenAt.toISOString() : null,
  };
}
