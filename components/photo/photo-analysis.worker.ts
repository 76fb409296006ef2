/// <reference lib="webworker" />
/**
 * Runs the photo analysis off the main thread. Takes the photo as a Blob,
 * decodes it with the browser's own decoder (EXIF orientation applied), and
 * reports progress as it goes. Very large photos are analysed at a reduced
 * size to bound memory; the results are scaled back to the photo's pixels.
 */
import { analysePhoto } from "@/lib/photo/analyse";
import { grayFromRgba } from "@/lib/photo/gray";

import type { AnalysisRequest, AnalysisResponse } from "./analysis-protocol";

const MAX_ANALYSIS_PIXELS = 24_000_000;

const post = (message: AnalysisResponse) =>
  (self as unknown as DedicatedWorkerGlobalScope).postMessage(message);

self.onmessage = async (event: MessageEvent<AnalysisRequest>) => {
  const { id, blob } = event.data;
  try {
    post({ id, type: "progress", stage: "reading", fraction: 0 });
    const bitmap = await createImageBitmap(blob, { imageOrientation: "from-image" });
    const { width, height } = bitmap;
    const scale = Math.min(1, Math.sqrt(MAX_ANALYSIS_PIXELS / (width * height)));
    const w = Math.max(1, Math.round(width * scale));
    const h = Math.max(1, Math.round(height * scale));
    const canvas = new OffscreenCanvas(w, h);
    const context = canvas.getContext("2d", { willReadFrequently: true });
    if (!context) throw new Error("This browser cannot read the photo's pixels.");
    context.drawImage(bitmap, 0, 0, w, h);
    bitmap.close();
    const rgba = context.getImageData(0, 0, w, h).data;
    const image = grayFromRgba({ rgba, width: w, height: h });
    post({ id, type: "progress", stage: "reading", fraction: 1 });
    const analysis = analysePhoto({
      image,
      onProgress: ({ stage, fraction }) => post({ id, type: "progress", stage, fraction }),
    });
    const back = 1 / scale;
    post({
      id,
      type: "done",
      widthPx: width,
      heightPx: height,
      limb: analysis.limb
        ? {
            ...analysis.limb,
            centreXPx: analysis.limb.centreXPx * back,
            centreYPx: analysis.limb.centreYPx * back,
            radiusPx: analysis.limb.radiusPx * back,
          }
        : null,
      candidates: analysis.candidates.map((c) => ({
        ...c,
        xPx: c.xPx * back,
        yPx: c.yPx * back,
        radiusPx: c.radiusPx * back,
        areaPx: c.areaPx * back * back,
      })),
      timings: analysis.timings,
    });
  } catch (error) {
    post({
      id,
      type: "error",
      message:
        error instanceof Error && error.name === "InvalidStateError"
          ? "This browser cannot decode the photo (TIFF photos can be traced after they are stored)."
          : `The photo could not be analysed: ${(error as Error).message}`,
    });
  }
};
