/**
 * Speed of the photo analysis: `npm run bench -- photo`.
 *
 * Makes a 4000 × 4000 synthetic disk photo (limb darkening, a soft cloud,
 * noise, a dozen spots), stores it as a colour JPEG (what cameras and phones
 * give) and then, with sharp (the decoder the server uses):
 * - decodes it to raw grayscale pixels (what the analysis reads),
 * - runs the limb fit and the spot finder on those pixels,
 * and reports the analysis time as a ratio of the decode time. Aim: the whole
 * analysis within 2× the decode, memory (resident set) under 1 GB. Medians of
 * several runs, after one warm-up.
 */
import { performance } from "node:perf_hooks";

import sharp from "sharp";

import { analysePhoto } from "../../lib/photo/analyse";
import { fitLimb } from "../../lib/photo/limb-fit";
import { findSpotCandidates } from "../../lib/photo/spot-candidates";
import { makeSyntheticDisk } from "../support/synthetic-disk";

const SIZE = 4000;
const RUNS = 5;

function median(values: number[]): number {
  const sorted = [...values].sort((a, b) => a - b);
  return sorted[sorted.length >> 1]!;
}

let peakRss = 0;
function sampleMemory() {
  peakRss = Math.max(peakRss, process.memoryUsage().rss);
}

async function main() {
  // One thread for the decoder too: the analysis is single-threaded, so the ratio compares like with like.
  sharp.concurrency(1);
  const truth = { centreXPx: 2011.4, centreYPx: 1987.6, radiusPx: 1790 };
  const spots = Array.from({ length: 12 }, (_, i) => {
    const angle = i * 2.399963;
    const rr = 0.15 + 0.06 * i;
    return {
      xPx: truth.centreXPx + truth.radiusPx * rr * Math.cos(angle),
      yPx: truth.centreYPx + truth.radiusPx * rr * Math.sin(angle),
      radiusPx: 6 + (i % 5) * 6,
    };
  });
  const gray = makeSyntheticDisk({
    width: SIZE,
    height: SIZE,
    ...truth,
    spots,
    clouds: [{ xPx: 900, yPx: 2900, radiusPx: 900, opacity: 0.4 }],
    noiseSigma: 5,
  });
  const jpeg = await sharp(Buffer.from(gray.data.buffer), { raw: { width: SIZE, height: SIZE, channels: 1 } })
    .toColourspace("srgb")
    .jpeg({ quality: 90 })
    .toBuffer();
  sampleMemory();
  console.log(`photo: ${SIZE} × ${SIZE} colour JPEG, ${(jpeg.length / 1e6).toFixed(1)} MB`);

  const decodeMs: number[] = [];
  let pixels: { data: Uint8Array; width: number; height: number } | undefined;
  for (let run = 0; run <= RUNS; run += 1) {
    const start = performance.now();
    const { data, info } = await sharp(jpeg).grayscale().raw().toBuffer({ resolveWithObject: true });
    const elapsed = performance.now() - start;
    if (run > 0) decodeMs.push(elapsed);
    pixels = {
      data: new Uint8Array(data.buffer, data.byteOffset, data.length),
      width: info.width,
      height: info.height,
    };
    sampleMemory();
  }
  const image = pixels!;

  const limbMs: number[] = [];
  const spotsMs: number[] = [];
  const wholeMs: number[] = [];
  let lastAnalysis = analysePhoto({ image });
  for (let run = 0; run < RUNS; run += 1) {
    let start = performance.now();
    const limb = fitLimb({ image });
    limbMs.push(performance.now() - start);
    start = performance.now();
    if (limb) findSpotCandidates({ image, limb });
    spotsMs.push(performance.now() - start);
    start = performance.now();
    lastAnalysis = analysePhoto({ image });
    wholeMs.push(performance.now() - start);
    sampleMemory();
  }

  const decode = median(decodeMs);
  const whole = median(wholeMs);
  const limb = lastAnalysis.limb;
  const centreErrorPct = limb
    ? (100 * Math.hypot(limb.centreXPx - truth.centreXPx, limb.centreYPx - truth.centreYPx)) / truth.radiusPx
    : NaN;
  const radiusErrorPct = limb ? (100 * Math.abs(limb.radiusPx - truth.radiusPx)) / truth.radiusPx : NaN;
  const found = spots.filter((s) =>
    lastAnalysis.candidates.some((c) => Math.hypot(c.xPx - s.xPx, c.yPx - s.yPx) < s.radiusPx + 3),
  ).length;

  console.log(`decode to raw grayscale (sharp): ${decode.toFixed(0)} ms`);
  console.log(`limb fit alone: ${median(limbMs).toFixed(0)} ms`);
  console.log(`spot candidates alone: ${median(spotsMs).toFixed(0)} ms`);
  console.log(
    `whole analysis (shared reduction): ${whole.toFixed(0)} ms = ${(whole / decode).toFixed(2)} × decode (aim ≤ 2)`,
  );
  console.log(
    `limb error: centre ${centreErrorPct.toFixed(3)} %, radius ${radiusErrorPct.toFixed(3)} % of R; spots found ${found}/${spots.length}, candidates ${lastAnalysis.candidates.length}`,
  );
  console.log(`peak resident memory: ${(peakRss / 1024 ** 2).toFixed(0)} MB (aim < 1024)`);
  console.log(
    JSON.stringify({
      bench: "photo",
      node: process.version,
      sizePx: SIZE,
      decodeMs: Math.round(decode),
      limbFitMs: Math.round(median(limbMs)),
      spotCandidatesMs: Math.round(median(spotsMs)),
      wholeAnalysisMs: Math.round(whole),
      analysisToDecodeRatio: Number((whole / decode).toFixed(2)),
      peakRssMb: Math.round(peakRss / 1024 ** 2),
      centreErrorPct: Number(centreErrorPct.toFixed(4)),
      radiusErrorPct: Number(radiusErrorPct.toFixed(4)),
      spotsFound: found,
      spotsPlanted: spots.length,
      candidates: lastAnalysis.candidates.length,
    }),
  );
}

void main();
