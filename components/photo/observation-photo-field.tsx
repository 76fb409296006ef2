"use client";

import { useEffect, useState } from "react";

import { exifTimeToUtc } from "@/lib/photo/exif";
import { checkPhotoBytes, PHOTO_ACCEPT } from "@/lib/photo/limits";
import { formatUt } from "@/lib/format/time";

import { PhotoAssist, type AssistOutcome } from "./photo-assist";

/** Enough of the file for its header and EXIF block. */
const HEAD_BYTES = 1024 * 1024;

/**
 * The photo step of the new-observation form: choose a disk photo, get an
 * early check of it (the server checks again after upload), its capture
 * time offered as the observation time, and the photo assist to trace on.
 * The photo itself is uploaded after the count is saved.
 */
export function ObservationPhotoField({
  timeZone,
  onPhotoChange,
  onAssistChange,
  onUseTime,
  onUseSpotCount,
}: {
  timeZone: string;
  onPhotoChange: (file: File | null) => void;
  onAssistChange: (outcome: AssistOutcome | null) => void;
  onUseTime: (at: Date) => void;
  onUseSpotCount: (spots: number) => void;
}) {
  const [file, setFile] = useState<File | null>(null);
  const [objectUrl, setObjectUrl] = useState<string | null>(null);
  const [error, setError] = useState<string | null>(null);
  const [takenAt, setTakenAt] = useState<Date | null>(null);
  const [takenAtExact, setTakenAtExact] = useState(false);
  const [accepted, setAccepted] = useState(0);

  useEffect(() => () => void (objectUrl && URL.revokeObjectURL(objectUrl)), [objectUrl]);

  async function choose(next: File | null) {
    setError(null);
    setTakenAt(null);
    setAccepted(0);
    onAssistChange(null);
    if (!next) {
      setFile(null);
      setObjectUrl(null);
      onPhotoChange(null);
      return;
    }
    const bytes = new Uint8Array(await next.slice(0, HEAD_BYTES).arrayBuffer());
    const check = checkPhotoBytes({ bytes, sizeBytes: next.size });
    if (!check.ok) {
      setError(check.message);
      setFile(null);
      setObjectUrl(null);
      onPhotoChange(null);
      return;
    }
    if (check.exif.takenAtText) {
      setTakenAt(
        exifTimeToUtc({
          takenAtText: check.exif.takenAtText,
          takenAtOffset: check.exif.takenAtOffset,
          timeZone,
        }),
      );
      setTakenAtExact(Boolean(check.exif.takenAtOffset));
    }
    setFile(next);
    setObjectUrl(URL.createObjectURL(next));
    onPhotoChange(next);
  }

  return (
    <div className="flex flex-col gap-3">
      <div className="flex flex-col gap-1">
        <label htmlFor="photo" className="text-sm font-medium text-ink-800">
          Disk photo (optional)
        </label>
        <input
          id="photo"
          type="file"
          accept={PHOTO_ACCEPT}
          aria-invalid={Boolean(error)}
          aria-describedby={error ? "photo-error" : "photo-hint"}
          onChange={(e) => void choose(e.target.files?.[0] ?? null)}
          className="text-sm file:mr-3 file:rounded-md file:border file:border-ink-200 file:bg-white file:px-3 file:py-1.5 file:text-sm file:font-semibold"
        />
        {error ? (
          <p id="photo-error" role="alert" className="text-sm text-caution-700">
            {error}
          </p>
        ) : (
          <p id="photo-hint" className="text-xs text-ink-500">
            JPEG, PNG, WebP or TIFF, up to 25 MB and 50 megapixels. It is stored with the count when you save.
          </p>
        )}
      </div>
      {takenAt ? (
        <p className="flex flex-wrap items-center gap-2 rounded-md bg-corona-50 px-3 py-2 text-sm text-ink-800">
          The photo was taken at {formatUt(takenAt)}
          {takenAtExact ? "" : ` (reading the camera clock as ${timeZone} time)`}.
          <button
            type="button"
            className="font-semibold text-corona-700 underline"
            onClick={() => onUseTime(takenAt)}
          >
            Use this time
          </button>
        </p>
      ) : null}
      {file && objectUrl ? (
        <>
          <PhotoAssist
            blob={file}
            displayUrl={objectUrl}
            onChange={(outcome) => {
              setAccepted(outcome.spots.length);
              onAssistChange(outcome);
            }}
          />
          {accepted > 0 ? (
            <p className="flex flex-wrap items-center gap-2 text-sm text-ink-800">
              You accepted {accepted} {accepted === 1 ? "spot" : "spots"} on the photo.
              <button
                type="button"
                className="font-semibold text-corona-700 underline"
                onClick={() => onUseSpotCount(accepted)}
              >
                Use {accepted} as the spot count (s)
              </button>
            </p>
          ) : null}
        </>
      ) : null}
    </div>
  );
}
