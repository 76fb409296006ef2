"use client";

import dynamic from "next/dynamic";
import { useEffect, useEffectEvent, useMemo, useRef, useState } from "react";

import { Button } from "@/components/ui/button";
import type { AcceptedLimb, AcceptedSpot, PhotoLook } from "@/lib/photo/to-tracing";
import type { SpotCandidate } from "@/lib/photo/spot-candidates";

import { overallProgress, usePhotoAnalysis } from "./use-photo-analysis";

// Konva touches `window` when it loads: client only.
const PhotoAssistCanvas = dynamic(() => import("./photo-assist-canvas"), {
  ssr: false,
  loading: () => <div className="aspect-square w-full animate-pulse rounded-md bg-ink-100" />,
});

export type LimbDraft = AcceptedLimb;
export type Decision = "proposed" | "accepted" | "rejected";
export type CandidateView = SpotCandidate & { decision: Decision };

export type AssistOutcome = {
  widthPx: number;
  heightPx: number;
  /** Set only once the observer has accepted it. */
  limb: AcceptedLimb | null;
  /** Only the spots the observer accepted. */
  spots: AcceptedSpot[];
  look: PhotoLook;
};

const STAGE_WORDS = {
  reading: "Reading the photo",
  limb: "Finding the limb",
  spots: "Looking for spots",
  done: "Done",
} as const;

/**
 * Photo-assisted tracing: the photo as the tracer's background layer (with
 * brightness and contrast), a proposed limb the observer accepts or adjusts,
 * and proposed spots the observer accepts, rejects or resizes one by one.
 * Nothing proposed counts until it is accepted.
 */
export function PhotoAssist({
  blob,
  displayUrl,
  onChange,
}: {
  /** The photo's bytes, analysed in a Web Worker. */
  blob: Blob;
  /** Where the canvas loads the photo from (an object URL of the same bytes, or the app's photo route). */
  displayUrl: string;
  onChange: (outcome: AssistOutcome) => void;
}) {
  const { state, analyse } = usePhotoAnalysis();
  const [limb, setLimb] = useState<LimbDraft | null>(null);
  const [limbAccepted, setLimbAccepted] = useState(false);
  const [candidates, setCandidates] = useState<CandidateView[]>([]);
  const [selectedId, setSelectedId] = useState<string | null>(null);
  const [look, setLook] = useState<PhotoLook>({ brightness: 1, contrast: 0 });
  const box = useRef<HTMLDivElement>(null);
  const [displayWidth, setDisplayWidth] = useState(640);

  useEffect(() => analyse(blob), [analyse, blob]);

  const result = state.status === "done" ? state.result : null;
  // A new analysis result resets the proposals (adjusting state while rendering, as React recommends).
  const [seenResult, setSeenResult] = useState<typeof result>(null);
  if (result && result !== seenResult) {
    setSeenResult(result);
    setLimb(
      result.limb
        ? {
            centreXPx: result.limb.centreXPx,
            centreYPx: result.limb.centreYPx,
            radiusPx: result.limb.radiusPx,
          }
        : null,
    );
    setLimbAccepted(false);
    setCandidates(result.candidates.map((c) => ({ ...c, decision: "proposed" })));
  }

  useEffect(() => {
    const element = box.current;
    if (!element) return;
    const observer = new ResizeObserver(([entry]) =>
      setDisplayWidth(Math.max(240, Math.floor(entry?.contentRect.width ?? 640))),
    );
    observer.observe(element);
    return () => observer.disconnect();
  }, []);

  const outcome = useMemo<AssistOutcome | null>(() => {
    if (!result) return null;
    return {
      widthPx: result.widthPx,
      heightPx: result.heightPx,
      limb: limbAccepted ? limb : null,
      spots: candidates
        .filter((c) => c.decision === "accepted")
        .map((c) => ({ id: c.id, xPx: c.xPx, yPx: c.yPx, radiusPx: c.radiusPx, hasUmbra: c.hasUmbra })),
      look,
    };
  }, [result, limb, limbAccepted, candidates, look]);
  const reportChange = useEffectEvent((next: AssistOutcome) => onChange(next));
  useEffect(() => {
    if (outcome) reportChange(outcome);
  }, [outcome]);

  const decide = (ids: string[], decision: Decision) =>
    setCandidates((list) => list.map((c) => (ids.includes(c.id) ? { ...c, decision } : c)));
  const resize = (id: string, radiusPx: number) =>
    setCandidates((list) =>
      list.map((c) => (c.id === id ? { ...c, radiusPx, areaPx: Math.PI * radiusPx * radiusPx } : c)),
    );
  const counts = {
    proposed: candidates.filter((c) => c.decision === "proposed").length,
    accepted: candidates.filter((c) => c.decision === "accepted").length,
    rejected: candidates.filter((c) => c.decision === "rejected").length,
  };

  return (
    <div className="flex flex-col gap-4" data-testid="photo-assist">
      <div ref={box} className="min-w-0">
        {result ? (
          <PhotoAssistCanvas
            imageUrl={displayUrl}
            widthPx={result.widthPx}
            heightPx={result.heightPx}
            displayWidth={displayWidth}
            brightness={look.brightness}
            contrast={look.contrast}
            limb={limb}
            limbAccepted={limbAccepted}
            candidates={candidates}
            selectedId={selectedId}
            onLimbChange={(next) => {
              setLimb(next);
              setLimbAccepted(false);
            }}
            onSelect={setSelectedId}
            onMoveCandidate={(id, xPx, yPx) =>
              setCandidates((list) => list.map((c) => (c.id === id ? { ...c, xPx, yPx } : c)))
            }
          />
        ) : (
          // eslint-disable-next-line @next/next/no-img-element -- a local object URL or a signed redirect, not an optimisable asset
          <img
            src={displayUrl}
            alt="The disk photo"
            className="w-full rounded-md bg-ink-900 object-contain"
          />
        )}
      </div>

      <div className="grid items-start gap-4 text-sm md:grid-cols-2">
        <div className="flex flex-col gap-4">
          {state.status === "running" ? (
            <div role="status" aria-live="polite" className="rounded-md border border-ink-100 bg-white p-3">
              <p className="font-medium text-ink-900">{STAGE_WORDS[state.stage]}…</p>
              <progress
                className="mt-2 h-2 w-full accent-corona-500"
                max={1}
                value={overallProgress(state.stage, state.fraction)}
                aria-label="Photo analysis progress"
              />
              <p className="mt-1 text-xs text-ink-500">
                This runs in the background; you can keep filling in the form.
              </p>
            </div>
          ) : null}
          {state.status === "error" ? (
            <p
              role="alert"
              className="rounded-md border border-caution-200 bg-caution-50 p-3 text-caution-800"
            >
              {state.message}
            </p>
          ) : null}

          <fieldset className="rounded-md border border-ink-100 bg-white p-3">
            <legend className="px-1 text-xs font-semibold tracking-wide text-ink-600 uppercase">
              Photo look
            </legend>
            <label className="flex items-center justify-between gap-3">
              Brightness
              <input
                type="range"
                min={0.4}
                max={2.5}
                step={0.05}
                value={look.brightness}
                onChange={(e) => setLook((l) => ({ ...l, brightness: Number(e.target.value) }))}
                aria-label="Brightness"
              />
            </label>
            <label className="mt-2 flex items-center justify-between gap-3">
              Contrast
              <input
                type="range"
                min={-50}
                max={80}
                step={1}
                value={look.contrast}
                onChange={(e) => setLook((l) => ({ ...l, contrast: Number(e.target.value) }))}
                aria-label="Contrast"
              />
            </label>
          </fieldset>

          {result ? (
            <section className="rounded-md border border-ink-100 bg-white p-3" aria-labelledby="limb-heading">
              <h3 id="limb-heading" className="font-semibold text-ink-900">
                Disk edge
              </h3>
              {limb ? (
                <>
                  <p className="mt-1 text-ink-700">
                    {limbAccepted ? "Accepted: " : "Proposed: "}centre {limb.centreXPx.toFixed(0)},{" "}
                    {limb.centreYPx.toFixed(0)} px, radius {limb.radiusPx.toFixed(0)} px
                    {result.limb && !limbAccepted
                      ? ` (edge found along ${Math.round(result.limb.coverage * 100)} % of the limb)`
                      : ""}
                    .
                  </p>
                  <div className="mt-2 grid grid-cols-3 gap-2">
                    {(
                      [
                        ["centreXPx", "Centre x"],
                        ["centreYPx", "Centre y"],
                        ["radiusPx", "Radius"],
                      ] as const
                    ).map(([key, label]) => (
                      <label key={key} className="flex flex-col text-xs text-ink-600">
                        {label}
                        <input
                          type="number"
                          step={1}
                          value={Math.round(limb[key])}
                          onChange={(e) => {
                            const value = Number(e.target.value);
                            if (!Number.isFinite(value) || (key === "radiusPx" && value < 10)) return;
                            setLimb({ ...limb, [key]: value });
                            setLimbAccepted(false);
                          }}
                          className="mt-0.5 rounded border border-ink-200 px-2 py-1 text-sm text-ink-900"
                        />
                      </label>
                    ))}
                  </div>
                  <p className="mt-1 text-xs text-ink-500">
                    Or drag the centre dot or the white edge handle on the photo. Spot marks can be dragged
                    too.
                  </p>
                  {limbAccepted ? (
                    <p className="mt-2 font-medium text-meadow-700">Disk edge accepted.</p>
                  ) : (
                    <Button type="button" className="mt-2" onClick={() => setLimbAccepted(true)}>
                      Accept disk edge
                    </Button>
                  )}
                </>
              ) : (
                <p className="mt-1 text-ink-700">
                  No disk edge was found in this photo. You can still keep the photo; mark the disk by hand in
                  the Disk tracer.
                </p>
              )}
            </section>
          ) : null}
        </div>
        {result && result.limb ? (
          <section className="rounded-md border border-ink-100 bg-white p-3" aria-labelledby="spots-heading">
            <h3 id="spots-heading" className="font-semibold text-ink-900">
              Possible spots
            </h3>
            <p className="mt-1 text-ink-700">
              {candidates.length === 0
                ? "No dark features stood out on the disk. If you see spots, add them in the Disk tracer."
                : `${counts.proposed} to decide · ${counts.accepted} accepted · ${counts.rejected} rejected. Only accepted spots are kept.`}
            </p>
            {counts.proposed > 0 ? (
              <div className="mt-2 flex flex-wrap gap-2">
                <Button
                  type="button"
                  onClick={() =>
                    decide(
                      candidates.filter((c) => c.decision === "proposed").map((c) => c.id),
                      "accepted",
                    )
                  }
                >
                  Accept the {counts.proposed} left
                </Button>
                <button
                  type="button"
                  className="rounded-md border border-ink-200 bg-white px-3 py-2 font-semibold"
                  onClick={() =>
                    decide(
                      candidates.filter((c) => c.decision === "proposed").map((c) => c.id),
                      "rejected",
                    )
                  }
                >
                  Reject the {counts.proposed} left
                </button>
              </div>
            ) : null}
            <ol className="mt-3 flex max-h-72 flex-col gap-1 overflow-y-auto">
              {candidates.map((c, index) => (
                <li
                  key={c.id}
                  className={`flex flex-wrap items-center gap-2 rounded px-2 py-1 ${c.id === selectedId ? "bg-corona-50" : ""}`}
                  data-testid="spot-candidate"
                  data-decision={c.decision}
                >
                  <button
                    type="button"
                    className="w-6 text-left font-semibold text-ink-900"
                    onClick={() => setSelectedId(c.id)}
                  >
                    {index + 1}
                  </button>
                  <span className="min-w-32 flex-1 text-xs text-ink-600">
                    {c.hasUmbra ? "with umbra" : "pore / faint"} · {Math.round(c.areaMsh)} MSH · at{" "}
                    {c.radialFraction.toFixed(2)} R
                  </span>
                  <label className="flex items-center gap-1 text-xs text-ink-600">
                    r
                    <input
                      type="number"
                      min={1}
                      step={0.5}
                      value={Number(c.radiusPx.toFixed(1))}
                      onChange={(e) => {
                        const value = Number(e.target.value);
                        if (Number.isFinite(value) && value >= 1) resize(c.id, value);
                      }}
                      className="w-16 rounded border border-ink-200 px-1 py-0.5 text-sm text-ink-900"
                      aria-label={`Size of spot ${index + 1} in pixels`}
                    />
                  </label>
                  <button
                    type="button"
                    aria-pressed={c.decision === "accepted"}
                    onClick={() => decide([c.id], "accepted")}
                    className={`rounded px-2 py-0.5 text-xs font-semibold ${c.decision === "accepted" ? "bg-meadow-700 text-white" : "border border-meadow-200 text-meadow-700"}`}
                  >
                    Accept
                  </button>
                  <button
                    type="button"
                    aria-pressed={c.decision === "rejected"}
                    onClick={() => decide([c.id], "rejected")}
                    className={`rounded px-2 py-0.5 text-xs font-semibold ${c.decision === "rejected" ? "bg-caution-700 text-white" : "border border-caution-200 text-caution-800"}`}
                  >
                    Reject
                  </button>
                </li>
              ))}
            </ol>
          </section>
        ) : null}
      </div>
    </div>
  );
}
