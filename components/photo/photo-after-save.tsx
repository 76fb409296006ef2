"use client";

import Link from "next/link";
import { useCallback, useEffect, useRef, useState } from "react";

import type { AssistOutcome } from "./photo-assist";
import { storeTracerHandoff } from "./tracer-handoff";
import { usePhotoUpload } from "./use-photo-upload";

type Step =
  { kind: "uploading" } | { kind: "done"; handedOver: number | null } | { kind: "failed"; message: string };

/**
 * After the count is saved: uploads the chosen photo to it and hands what
 * the observer accepted on the photo to the Disk tracer. The count is
 * already safe, so a failure here only costs the photo, and "Try again"
 * repeats the upload.
 */
export function PhotoAfterSave({
  file,
  assist,
  observationId,
}: {
  file: File;
  assist: AssistOutcome | null;
  observationId: string;
}) {
  const { upload, progress } = usePhotoUpload();
  const [step, setStep] = useState<Step>({ kind: "uploading" });
  const started = useRef(false);

  const run = useCallback(async () => {
    setStep({ kind: "uploading" });
    const stored = await upload({ file, observationId });
    if (!stored.ok) {
      setStep({ kind: "failed", message: stored.message });
      return;
    }
    const marked = assist && (assist.limb || assist.spots.length > 0) ? assist : null;
    if (marked) storeTracerHandoff({ observationId, photoId: stored.photoId, outcome: marked });
    setStep({ kind: "done", handedOver: marked ? marked.spots.length : null });
  }, [assist, file, observationId, upload]);

  useEffect(() => {
    if (started.current) return;
    started.current = true;
    void run();
  }, [run]);

  return (
    <div className="rounded-md border border-ink-100 bg-white p-3 text-sm" data-testid="photo-after-save">
      {step.kind === "uploading" ? (
        <p role="status">Storing the photo{progress !== null ? ` (${Math.round(progress)} %)` : ""}…</p>
      ) : null}
      {step.kind === "done" ? (
        <div role="status" className="flex flex-col gap-1 text-meadow-700">
          <p>Photo stored with the count.</p>
          {step.handedOver !== null ? (
            <p>
              <Link href={`/logbook/${observationId}/trace`} className="font-semibold underline">
                Continue in the Disk tracer
              </Link>{" "}
              with the disk edge and {step.handedOver} {step.handedOver === 1 ? "spot" : "spots"} you
              accepted, to orient, group and classify them.
            </p>
          ) : null}
        </div>
      ) : null}
      {step.kind === "failed" ? (
        <div role="alert" className="flex flex-col gap-2 text-caution-800">
          <p>{step.message}</p>
          <div className="flex gap-3">
            <button
              type="button"
              className="rounded-md border border-caution-200 bg-white px-3 py-1.5 font-semibold"
              onClick={() => void run()}
            >
              Try again
            </button>
            <Link href={`/logbook/${observationId}`} className="self-center underline">
              Add it later from the observation page
            </Link>
          </div>
        </div>
      ) : null}
    </div>
  );
}
