/**
 * The whole photo analysis: limb fit, then spot candidates inside the fitted
 * disk. Runs in a Web Worker in the browser and directly in Node.
 */
import { downsampleGray, type FloatImage, type GrayImage, type ProgressFn } from "./gray";
import { fitLimb, type LimbFit } from "./limb-fit";
import { findSpotCandidates, type SpotCandidate, type SpotOptions } from "./spot-candidates";

export type PhotoAnalysis = {
  widthPx: number;
  heightPx: number;
  limb: LimbFit | null;
  candidates: SpotCandidate[];
  timings: { limbMs: number; spotsMs: number };
};

export function analysePhoto({
  image,
  onProgress,
  spotOptions,
}: {
  image: GrayImage;
  onProgress?: ProgressFn;
  spotOptions?: SpotOptions;
}): PhotoAnalysis {
  const started = now();
  // Both steps work on reduced copies; a 2× copy made once serves both when the photo is large.
  const shared = sharedReduction(image);
  const limb = fitLimb({ image, onProgress, ...(shared ? { reduced: shared.forLimb } : {}) });
  const limbDone = now();
  const candidates = limb
    ? findSpotCandidates({
        image,
        limb,
        options: spotOptions,
        onProgress,
        ...(shared ? { reduced: shared.base } : {}),
      })
    : [];
  const spotsDone = now();
  onProgress?.({ stage: "done", fraction: 1 });
  return {
    widthPx: image.width,
    heightPx: image.height,
    limb,
    candidates,
    timings: { limbMs: limbDone - started, spotsMs: spotsDone - limbDone },
  };
}

/**
 * For big photos, one reduced copy serves both steps: the spot finder works
 * on it directly (a disk usually spans 70–95 % of the short side, so its
 * radius there is near the spot finder's working size) and the limb fit on a
 * further reduction. Touching the full-size pixels once is most of the cost.
 */
function sharedReduction(
  image: GrayImage,
): { base: { image: FloatImage; factor: number }; forLimb: { image: FloatImage; factor: number } } | null {
  const baseFactor = Math.round((0.4 * Math.min(image.width, image.height)) / 620);
  if (baseFactor < 2) return null;
  const base = downsampleGray({ image, factor: baseFactor });
  const further = Math.max(1, Math.ceil(Math.max(base.width, base.height) / 640));
  const forLimb = downsampleGray({ image: base, factor: further });
  return {
    base: { image: base, factor: baseFactor },
    forLimb: { image: forLimb, factor: baseFactor * further },
  };
}

function now(): number {
  return typeof performance !== "undefined" ? performance.now() : Date.now();
}
