"use client";

import Link from "next/link";
import { useRouter } from "next/navigation";
import { useEffect, useState } from "react";

import { Button } from "@/components/ui/button";
import { formatUt } from "@/lib/format/time";
import { checkPhotoBytes, formatMegabytes, PHOTO_ACCEPT } from "@/lib/photo/limits";

import { PhotoAssist, type AssistOutcome } from "./photo-assist";
import { photoViewUrl, storeTracerHandoff } from "./tracer-handoff";
import { usePhotoUpload } from "./use-photo-upload";

export type PhotoSummary = {
  id: string;
  name: string;
  sizeBytes: number;
  mimeType: string;
  widthPx: number | null;
  heightPx: number | null;
  exifTakenAtIso: string | null;
};

/**
 * The photo part of an observation page: the stored photo (or a way to add
 * one, again if the store was down), photo-assisted tracing, and removal.
 */
export function PhotoPanel({
  observationId,
  photos,
  editable,
}: {
  observationId: string;
  photos: PhotoSummary[];
  /** Only the owner adds, traces and removes. */
  editable: boolean;
}) {
  const photo = photos[0] ?? null;
  return (
    <section className="mt-6 rounded-lg border border-ink-100 bg-white p-6" aria-labelledby="photo-heading">
      <h2 id="photo-heading" className="text-lg font-semibold text-ink-950">
        Disk photo
      </h2>
      {photo ? (
        <StoredPhoto observationId={observationId} photo={photo} editable={editable} />
      ) : editable ? (
        <AddPhoto observationId={observationId} />
      ) : (
        <p className="mt-2 text-sm text-ink-600">No photo was kept with this count.</p>
      )}
    </section>
  );
}

function StoredPhoto({
  observationId,
  photo,
  editable,
}: {
  observationId: string;
  photo: PhotoSummary;
  editable: boolean;
}) {
  const router = useRouter();
  const [tracing, setTracing] = useState(false);
  const [message, setMessage] = useState<{ tone: "ok" | "error"; text: string } | null>(null);
  const [removing, setRemoving] = useState(false);

  async function remove() {
    if (!window.confirm("Remove this photo from the count? The file is deleted.")) return;
    setRemoving(true);
    const response = await fetch(`/api/v1/photos/${photo.id}`, { method: "DELETE" }).catch(() => null);
    setRemoving(false);
    if (response?.ok) router.refresh();
    else
      setMessage({
        tone: "error",
        text: (await readError(response)) ?? "The photo could not be removed; try again.",
      });
  }

  return (
    <div className="mt-3 flex flex-col gap-4">
      <div className="flex flex-wrap items-start gap-4">
        <a href={photoViewUrl(photo.id)} target="_blank" rel="noreferrer" className="shrink-0">
          {/* eslint-disable-next-line @next/next/no-img-element -- a private photo behind a signed redirect */}
          <img
            src={`/api/v1/photos/${photo.id}/image?variant=thumbnail`}
            alt={`Thumbnail of ${photo.name}`}
            className="h-40 w-40 rounded-md bg-ink-900 object-contain"
            data-testid="photo-thumbnail"
          />
        </a>
        <dl className="grid grid-cols-[8rem_1fr] gap-x-3 gap-y-1 text-sm">
          <dt className="text-ink-500">File</dt>
          <dd className="text-ink-900">{photo.name}</dd>
          <dt className="text-ink-500">Size</dt>
          <dd className="text-ink-900">
            {photo.widthPx} × {photo.heightPx} px · {formatMegabytes(photo.sizeBytes)} ·{" "}
            {photo.mimeType.replace("image/", "").toUpperCase()}
          </dd>
          <dt className="text-ink-500">Camera time</dt>
          <dd className="text-ink-900">
            {photo.exifTakenAtIso ? formatUt(photo.exifTakenAtIso) : "not recorded"}
          </dd>
        </dl>
      </div>
      {editable ? (
        <div className="flex flex-wrap gap-3">
          <Button type="button" onClick={() => setTracing((t) => !t)}>
            {tracing ? "Close photo assist" : "Find the disk and spots"}
          </Button>
          <Link
            href={`/logbook/${observationId}/trace`}
            className="rounded-md border border-ink-200 bg-white px-4 py-2 text-sm font-semibold"
          >
            Open in the Disk tracer
          </Link>
          <button
            type="button"
            disabled={removing}
            onClick={() => void remove()}
            className="rounded-md border border-caution-200 bg-white px-4 py-2 text-sm font-semibold text-caution-800"
          >
            {removing ? "Removing…" : "Remove photo"}
          </button>
        </div>
      ) : null}
      {message ? (
        <p
          role={message.tone === "error" ? "alert" : "status"}
          className={message.tone === "error" ? "text-sm text-caution-800" : "text-sm text-meadow-700"}
        >
          {message.text}
        </p>
      ) : null}
      {tracing ? (
        <AssistOnStoredPhoto
          onContinue={(outcome) => {
            storeTracerHandoff({ observationId, photoId: photo.id, outcome });
            router.push(`/logbook/${observationId}/trace`);
          }}
          photoId={photo.id}
        />
      ) : null}
    </div>
  );
}

/** Fetches the stored photo once (through the app's access-checked route) for the worker and the canvas. */
function AssistOnStoredPhoto({
  photoId,
  onContinue,
}: {
  photoId: string;
  onContinue: (outcome: AssistOutcome) => void;
}) {
  const [loaded, setLoaded] = useState<{ blob: Blob; url: string } | null>(null);
  const [error, setError] = useState<string | null>(null);
  const [outcome, setOutcome] = useState<AssistOutcome | null>(null);

  useEffect(() => {
    let url: string | null = null;
    let cancelled = false;
    fetch(photoViewUrl(photoId))
      .then(async (response) => {
        if (!response.ok) throw new Error(String(response.status));
        const blob = await response.blob();
        if (cancelled) return;
        url = URL.createObjectURL(blob);
        setLoaded({ blob, url });
      })
      .catch(() => setError("The photo could not be loaded from the photo store. Try again in a moment."));
    return () => {
      cancelled = true;
      if (url) URL.revokeObjectURL(url);
    };
  }, [photoId]);

  if (error)
    return (
      <p role="alert" className="text-sm text-caution-800">
        {error}
      </p>
    );
  if (!loaded)
    return (
      <p role="status" className="text-sm text-ink-600">
        Loading the photo…
      </p>
    );
  const ready = outcome && (outcome.limb || outcome.spots.length > 0);
  return (
    <div className="flex flex-col gap-3">
      <PhotoAssist blob={loaded.blob} displayUrl={loaded.url} onChange={setOutcome} />
      <div>
        <Button type="button" disabled={!ready} onClick={() => outcome && onContinue(outcome)}>
          Continue in the Disk tracer with these marks
        </Button>
        {!ready ? (
          <p className="mt-1 text-xs text-ink-500">Accept the disk edge or at least one spot first.</p>
        ) : null}
      </div>
    </div>
  );
}

function AddPhoto({ observationId }: { observationId: string }) {
  const router = useRouter();
  const { upload, progress } = usePhotoUpload();
  const [file, setFile] = useState<File | null>(null);
  const [error, setError] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);

  async function choose(next: File | null) {
    setError(null);
    setFile(null);
    if (!next) return;
    const check = checkPhotoBytes({
      bytes: new Uint8Array(await next.slice(0, 1024 * 1024).arrayBuffer()),
      sizeBytes: next.size,
    });
    if (!check.ok) setError(check.message);
    else setFile(next);
  }

  async function send() {
    if (!file) return;
    setBusy(true);
    setError(null);
    const result = await upload({ file, observationId });
    setBusy(false);
    if (result.ok) router.refresh();
    else setError(result.message);
  }

  return (
    <div className="mt-3 flex flex-col gap-2">
      <p className="text-sm text-ink-600">
        No photo yet. Add a photo of the projected or filtered disk to keep it with this count and trace on
        it.
      </p>
      <label htmlFor="add-photo" className="text-sm font-medium text-ink-800">
        Disk photo
      </label>
      <input
        id="add-photo"
        type="file"
        accept={PHOTO_ACCEPT}
        onChange={(e) => void choose(e.target.files?.[0] ?? null)}
        aria-invalid={Boolean(error)}
        className="text-sm file:mr-3 file:rounded-md file:border file:border-ink-200 file:bg-white file:px-3 file:py-1.5 file:text-sm file:font-semibold"
      />
      {error ? (
        <p role="alert" className="text-sm text-caution-800">
          {error}
        </p>
      ) : null}
      <Button type="button" disabled={!file || busy} onClick={() => void send()} className="self-start">
        {busy
          ? `Storing${progress !== null ? ` ${Math.round(progress)} %` : ""}…`
          : error && file
            ? "Try again"
            : "Add photo"}
      </Button>
    </div>
  );
}

async function readError(response: Response | null): Promise<string | null> {
  if (!response) return null;
  const body = (await response.json().catch(() => null)) as { error?: { message?: string } } | null;
  return body?.error?.message ?? null;
}
