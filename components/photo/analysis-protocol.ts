import type { AnalysisStage } from "@/lib/photo/gray";
import type { LimbFit } from "@/lib/photo/limb-fit";
import type { SpotCandidate } from "@/lib/photo/spot-candidates";

/** Messages between the page and the analysis worker. */
export type AnalysisRequest = { id: number; blob: Blob };

export type AnalysisResult = {
  widthPx: number;
  heightPx: number;
  limb: LimbFit | null;
  candidates: SpotCandidate[];
  timings: { limbMs: number; spotsMs: number };
};

export type AnalysisResponse =
  | { id: number; type: "progress"; stage: AnalysisStage; fraction: number }
  | ({ id: number; type: "done" } & AnalysisResult)
  | { id: number; type: "error"; message: string };
