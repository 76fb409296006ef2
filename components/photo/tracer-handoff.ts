"use client";

import { buildTracingFromPhoto } from "@/lib/photo/to-tracing";
import type { TracingDocument } from "@/lib/validation/tracing";

import type { AssistOutcome } from "./photo-assist";

export const photoViewUrl = (photoId: string) => `/api/v1/photos/${photoId}/image?variant=view`;

const keyFor = (observationId: string) => `heliotally:photo-assist:${observationId}`;

type Handoff = { photoId: string; outcome: AssistOutcome; storedAt: number };

/**
 * The Disk tracer saves only a finished tracing (oriented, every spot in a
 * group), so what the observer accepted on the photo is handed to the tracer
 * as its starting point rather than saved half-done: kept in this tab's
 * session storage until the tracer page opens.
 */
export function storeTracerHandoff({
  observationId,
  photoId,
  outcome,
}: {
  observationId: string;
  photoId: string;
  outcome: AssistOutcome;
}) {
  try {
    sessionStorage.setItem(
      keyFor(observationId),
      JSON.stringify({ photoId, outcome, storedAt: Date.now() } satisfies Handoff),
    );
  } catch {
    // Storage full or disabled: the tracer opens with the photo only.
  }
}

/** Forgets a handoff once the tracer has opened with it. */
export function clearTracerHandoff({ observationId }: { observationId: string }) {
  try {
    sessionStorage.removeItem(keyFor(observationId));
  } catch {
    // nothing to forget
  }
}

/** The tracer's starting document with the accepted marks added; null when nothing was handed over. */
export function readTracerHandoff({
  observationId,
  base,
}: {
  observationId: string;
  base: TracingDocument | null;
}): TracingDocument | null {
  let handoff: Handoff | null = null;
  try {
    const raw = sessionStorage.getItem(keyFor(observationId));
    handoff = raw ? (JSON.parse(raw) as Handoff) : null;
  } catch {
    return null;
  }
  // An hour is plenty between accepting marks and opening the tracer.
  if (!handoff || Date.now() - handoff.storedAt > 60 * 60 * 1000) return null;
  const { photoId, outcome } = handoff;
  return buildTracingFromPhoto({
    photo: {
      id: photoId,
      imageUrl: photoViewUrl(photoId),
      widthPx: outcome.widthPx,
      heightPx: outcome.heightPx,
    },
    limb: outcome.limb,
    spots: outcome.spots,
    look: outcome.look,
    base,
  });
}
