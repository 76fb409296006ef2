"use client";

import { useCallback, useRef, useState } from "react";

import type { PhotoUploadResult } from "@/app/api/uploadthing/core";

import { useUploadThing } from "./upload-helpers";

export const STORE_UNREACHABLE =
  "The photo store could not be reached, so the photo was not stored. Your count is kept; try adding the photo again in a few minutes.";

/**
 * Uploads one photo to an observation through the SDK and turns every way it
 * can go wrong into one sentence for the observer. The server's content
 * checks answer through serverData (a refused file is already deleted).
 */
export function usePhotoUpload() {
  const [progress, setProgress] = useState<number | null>(null);
  // The SDK's startUpload reports failures only through onUploadError (it then resolves to undefined).
  const lastError = useRef<unknown>(null);
  const { startUpload } = useUploadThing("observationPhoto", {
    uploadProgressGranularity: "fine",
    onUploadProgress: (p) => setProgress(p),
    onUploadError: (error) => {
      lastError.current = error;
    },
  });

  const upload = useCallback(
    async ({ file, observationId }: { file: File; observationId: string }): Promise<PhotoUploadResult> => {
      setProgress(0);
      lastError.current = null;
      try {
        const result = await startUpload([file], { observationId });
        if (!result && lastError.current)
          return { ok: false, message: explainUploadError(lastError.current) };
        const serverData = result?.[0]?.serverData as PhotoUploadResult | null | undefined;
        if (!serverData)
          return {
            ok: false,
            message:
              "The photo was sent but the store did not confirm it. Check the observation page, then try again.",
          };
        return serverData;
      } catch (error) {
        return { ok: false, message: explainUploadError(error) };
      } finally {
        setProgress(null);
      }
    },
    [startUpload],
  );

  return { upload, progress };
}

function explainUploadError(error: unknown): string {
  const message = error instanceof Error ? error.message : "";
  // A failed fetch (store down, connection dropped) surfaces as a generic network message.
  if (!message || /fetch|network|connect|ECONNREFUSED|Failed to upload|timed? ?out|went wrong/i.test(message))
    return STORE_UNREACHABLE;
  return message;
}
