/**
 * Grayscale images as plain typed arrays, so the analysis runs unchanged in a
 * browser Web Worker and in Node (tests, benchmark).
 */

export type GrayImage = {
  /** Row-major, one value per pixel. */
  data: Uint8Array | Uint8ClampedArray | Float32Array;
  width: number;
  height: number;
};

export type FloatImage = { data: Float32Array; width: number; height: number };

export type ProgressFn = (progress: { stage: AnalysisStage; fraction: number }) => void;
export type AnalysisStage = "reading" | "limb" | "spots" | "done";

/** Rec. 601 luma from RGBA bytes (canvas ImageData), the usual weights. */
export function grayFromRgba({
  rgba,
  width,
  height,
}: {
  rgba: Uint8Array | Uint8ClampedArray;
  width: number;
  height: number;
}): GrayImage {
  const data = new Uint8Array(width * height);
  for (let i = 0, j = 0; i < data.length; i += 1, j += 4) {
    data[i] = (rgba[j]! * 77 + rgba[j + 1]! * 150 + rgba[j + 2]! * 29) >> 8;
  }
  return { data, width, height };
}

/**
 * Box-averages `factor × factor` blocks. Output pixel (i, j) covers input
 * pixels [i·f, i·f + f); its centre sits at input coordinate i·f + (f − 1)/2.
 */
export function downsampleGray({ image, factor }: { image: GrayImage; factor: number }): FloatImage {
  const f = Math.max(1, Math.floor(factor));
  const { data, width, height } = image;
  if (f === 1) return { data: Float32Array.from(data), width, height };
  const outW = Math.floor(width / f);
  const outH = Math.floor(height / f);
  const out = new Float32Array(outW * outH);
  const scale = 1 / (f * f);
  const acc = new Float64Array(outW);
  const span = outW * f;
  for (let oy = 0; oy < outH; oy += 1) {
    acc.fill(0);
    for (let k = 0; k < f; k += 1) {
      const rowStart = (oy * f + k) * width;
      // Walk the row once; `ox` advances every f pixels (no division per pixel).
      let ox = 0;
      let m = 0;
      let sum = 0;
      for (let x = 0; x < span; x += 1) {
        sum += data[rowStart + x]!;
        m += 1;
        if (m === f) {
          acc[ox]! += sum;
          ox += 1;
          m = 0;
          sum = 0;
        }
      }
    }
    const rowOut = oy * outW;
    for (let ox = 0; ox < outW; ox += 1) out[rowOut + ox] = acc[ox]! * scale;
  }
  return { data: out, width: outW, height: outH };
}

/** Input-pixel coordinate of the centre of a downsampled pixel, and back. */
export const toFull = (small: number, factor: number) => small * factor + (factor - 1) / 2;
export const toSmall = (full: number, factor: number) => (full - (factor - 1) / 2) / factor;

/** Bilinear sample with the edge clamped; NaN outside the image. */
export function sampleBilinear(image: GrayImage, x: number, y: number): number {
  const { data, width, height } = image;
  if (x < 0 || y < 0 || x > width - 1 || y > height - 1) return Number.NaN;
  const x0 = Math.floor(x);
  const y0 = Math.floor(y);
  const x1 = Math.min(x0 + 1, width - 1);
  const y1 = Math.min(y0 + 1, height - 1);
  const fx = x - x0;
  const fy = y - y0;
  const a = data[y0 * width + x0]!;
  const b = data[y0 * width + x1]!;
  const c = data[y1 * width + x0]!;
  const d = data[y1 * width + x1]!;
  return a + (b - a) * fx + (c - a) * fy + (a - b - c + d) * fx * fy;
}

/** A small seeded generator (mulberry32) so every run of the analysis is repeatable. */
export function makeRandom(seed: number): () => number {
  let s = seed >>> 0;
  return () => {
    s = (s + 0x6d2b79f5) >>> 0;
    let t = s;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** Median of a copy (the input is left alone). */
export function medianOf(values: ArrayLike<number>): number {
  const sorted = Float64Array.from(values).sort();
  const n = sorted.length;
  if (n === 0) return Number.NaN;
  const mid = n >> 1;
  return n % 2 ? sorted[mid]! : (sorted[mid - 1]! + sorted[mid]!) / 2;
}
