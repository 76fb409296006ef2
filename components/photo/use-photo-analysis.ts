"use client";

import { useCallback, useEffect, useRef, useState } from "react";

import type { AnalysisStage } from "@/lib/photo/gray";

import type { AnalysisRequest, AnalysisResponse, AnalysisResult } from "./analysis-protocol";

export type AnalysisState =
  | { status: "idle" }
  | { status: "running"; stage: AnalysisStage; fraction: number }
  | { status: "done"; result: AnalysisResult }
  | { status: "error"; message: string };

/** The stages' share of the whole bar, so progress moves forward evenly. */
const STAGE_SPAN: Record<AnalysisStage, [number, number]> = {
  reading: [0, 0.3],
  limb: [0.3, 0.6],
  spots: [0.6, 0.98],
  done: [1, 1],
};

export function overallProgress(stage: AnalysisStage, fraction: number): number {
  const [from, to] = STAGE_SPAN[stage];
  return from + (to - from) * fraction;
}

/** Runs the analysis in a Web Worker; the page stays responsive and shows progress. */
export function usePhotoAnalysis() {
  const [state, setState] = useState<AnalysisState>({ status: "idle" });
  const workerRef = useRef<Worker | null>(null);
  const requestId = useRef(0);

  useEffect(
    () => () => {
      workerRef.current?.terminate();
      workerRef.current = null;
    },
    [],
  );

  const analyse = useCallback((blob: Blob) => {
    // A new photo replaces any analysis still running.
    workerRef.current?.terminate();
    const worker = new Worker(new URL("./photo-analysis.worker.ts", import.meta.url), { type: "module" });
    workerRef.current = worker;
    const id = (requestId.current += 1);
    setState({ status: "running", stage: "reading", fraction: 0 });
    worker.onmessage = (event: MessageEvent<AnalysisResponse>) => {
      const message = event.data;
      if (message.id !== id) return;
      if (message.type === "progress")
        setState({ status: "running", stage: message.stage, fraction: message.fraction });
      else if (message.type === "error") setState({ status: "error", message: message.message });
      else {
        const { id: _id, type: _type, ...result } = message;
        void _id;
        void _type;
        setState({ status: "done", result });
        worker.terminate();
        if (workerRef.current === worker) workerRef.current = null;
      }
    };
    worker.onerror = () =>
      setState({
        status: "error",
        message: "The photo analysis stopped unexpectedly. Reload the page and try again.",
      });
    worker.postMessage({ id, blob } satisfies AnalysisRequest);
  }, []);

  const reset = useCallback(() => {
    workerRef.current?.terminate();
    workerRef.current = null;
    setState({ status: "idle" });
  }, []);

  return { state, analyse, reset };
}
