/**
 * Finds the solar limb in a disk photo and fits its centre and radius.
 *
 * 1. On a reduced copy (≤ 640 px), gradient edge points whose gradient points
 *    inwards; RANSAC over circles through three of them picks the circle most
 *    edge points agree with (a cloud edge, a spot or a frame border agree with
 *    few), then a least-squares fit of its inliers.
 * 2. At full resolution, along rays from that centre, the steepest drop of a
 *    smoothed radial profile near the circle gives one limb point per ray.
 *    Rays that leave the frame (cut-off limb) or show a weak step (limb under
 *    cloud) are skipped; a trimmed geometric fit drops the rest of the misfits.
 *
 * Limb darkening only dims the disk towards the edge; the step at the edge
 * stays the steepest drop, so it needs no model here. An uneven background
 * changes the step's height, not its place.
 */
import {
  fitCircleAlgebraic,
  fitCircleTrimmed,
  circleThroughPoints,
  refineCircleGeometric,
  type Circle,
} from "./circle-fit";
import {
  downsampleGray,
  makeRandom,
  medianOf,
  sampleBilinear,
  toFull,
  type FloatImage,
  type GrayImage,
  type ProgressFn,
} from "./gray";

export type LimbFit = {
  centreXPx: number;
  centreYPx: number;
  radiusPx: number;
  /** Limb points used in the final fit / rays cast. */
  edgePointsUsed: number;
  raysCast: number;
  /** Fraction of the full circle where a limb point was found (a cut-off or clouded limb gives less). */
  coverage: number;
  /** RMS distance of the used limb points from the circle. */
  rmsPx: number;
};

const WORK_MAX_PX = 640;

export function fitLimb({
  image,
  onProgress,
  reduced,
}: {
  image: GrayImage;
  onProgress?: ProgressFn;
  /** A reduced copy (about 640 px across) the caller already made, to save a pass over the photo. */
  reduced?: { image: FloatImage; factor: number };
}): LimbFit | null {
  const factor = reduced?.factor ?? Math.max(1, Math.ceil(Math.max(image.width, image.height) / WORK_MAX_PX));
  const small = reduced?.image ?? downsampleGray({ image, factor });
  onProgress?.({ stage: "limb", fraction: 0.15 });

  const coarse = findCoarseCircle(small);
  if (!coarse) return null;
  onProgress?.({ stage: "limb", fraction: 0.5 });

  const start: Circle = {
    cx: toFull(coarse.cx, factor),
    cy: toFull(coarse.cy, factor),
    r: coarse.r * factor,
  };
  // Two passes: the second casts its rays from the better centre of the first.
  let fit = refineOnRays({ image, start, bandPx: Math.max(6 * factor, 0.04 * start.r) });
  onProgress?.({ stage: "limb", fraction: 0.8 });
  if (fit) fit = refineOnRays({ image, start: fit.circle, bandPx: Math.max(4, 0.015 * fit.circle.r) }) ?? fit;
  onProgress?.({ stage: "limb", fraction: 1 });
  if (!fit) return null;
  return {
    centreXPx: fit.circle.cx,
    centreYPx: fit.circle.cy,
    radiusPx: fit.circle.r,
    edgePointsUsed: fit.used,
    raysCast: fit.rays,
    coverage: fit.coverage,
    rmsPx: fit.rmsPx,
  };
}

// ------------------------------------------------------------ coarse circle

type EdgePoints = { xs: Float32Array; ys: Float32Array; nx: Float32Array; ny: Float32Array; count: number };

function findCoarseCircle(small: FloatImage): Circle | null {
  const edges = collectEdgePoints(small);
  if (edges.count < 12) return null;
  const minR = 0.04 * Math.min(small.width, small.height);
  const maxR = 1.5 * Math.max(small.width, small.height);
  const random = makeRandom(0x5eed);
  const n = edges.count;
  // Hypotheses are scored on a fixed random subset: the ranking is the same, the cost a fraction.
  const subset = pickSubset(edges, 700, random);
  let best: Circle | null = null;
  let bestScore = 0;
  const iterations = 600;
  for (let it = 0; it < iterations; it += 1) {
    const a = Math.floor(random() * n);
    const b = Math.floor(random() * n);
    const c = Math.floor(random() * n);
    if (a === b || b === c || a === c) continue;
    const circle = circleThroughPoints(
      edges.xs[a]!,
      edges.ys[a]!,
      edges.xs[b]!,
      edges.ys[b]!,
      edges.xs[c]!,
      edges.ys[c]!,
    );
    if (!circle || circle.r < minR || circle.r > maxR) continue;
    if (!pointsInward(edges, a, circle) || !pointsInward(edges, b, circle) || !pointsInward(edges, c, circle))
      continue;
    const score = scoreCircle(subset, circle);
    if (score > bestScore) {
      bestScore = score;
      best = circle;
    }
  }
  if (!best || bestScore < Math.min(12, subset.count / 4)) return null;
  // Least squares over the inliers, twice, widening nothing.
  for (let round = 0; round < 2; round += 1) {
    const keep = inlierMask(edges, best);
    const xs: number[] = [];
    const ys: number[] = [];
    for (let i = 0; i < n; i += 1) {
      if (keep[i]) {
        xs.push(edges.xs[i]!);
        ys.push(edges.ys[i]!);
      }
    }
    const algebraic = fitCircleAlgebraic({ xs, ys });
    if (!algebraic) break;
    best = refineCircleGeometric({ xs, ys, start: algebraic });
  }
  return best;
}

function pickSubset(edges: EdgePoints, size: number, random: () => number): EdgePoints {
  if (edges.count <= size) return edges;
  const xs = new Float32Array(size);
  const ys = new Float32Array(size);
  const nx = new Float32Array(size);
  const ny = new Float32Array(size);
  for (let k = 0; k < size; k += 1) {
    const i = Math.floor(random() * edges.count);
    xs[k] = edges.xs[i]!;
    ys[k] = edges.ys[i]!;
    nx[k] = edges.nx[i]!;
    ny[k] = edges.ny[i]!;
  }
  return { xs, ys, nx, ny, count: size };
}

function tolerancePx(circle: Circle) {
  return Math.max(1.5, 0.008 * circle.r);
}

function pointsInward(edges: EdgePoints, i: number, circle: Circle): boolean {
  const dx = circle.cx - edges.xs[i]!;
  const dy = circle.cy - edges.ys[i]!;
  const d = Math.hypot(dx, dy) || 1;
  return (dx * edges.nx[i]! + dy * edges.ny[i]!) / d > 0.8;
}

function scoreCircle(edges: EdgePoints, circle: Circle): number {
  const tol = tolerancePx(circle);
  let score = 0;
  for (let i = 0; i < edges.count; i += 1) {
    const d = Math.hypot(edges.xs[i]! - circle.cx, edges.ys[i]! - circle.cy);
    if (Math.abs(d - circle.r) < tol && pointsInward(edges, i, circle)) score += 1;
  }
  return score;
}

function inlierMask(edges: EdgePoints, circle: Circle): Uint8Array {
  const tol = tolerancePx(circle) * 1.5;
  const keep = new Uint8Array(edges.count);
  for (let i = 0; i < edges.count; i += 1) {
    const d = Math.hypot(edges.xs[i]! - circle.cx, edges.ys[i]! - circle.cy);
    keep[i] = Math.abs(d - circle.r) < tol && pointsInward(edges, i, circle) ? 1 : 0;
  }
  return keep;
}

/**
 * Sobel gradients; keeps local maxima of the magnitude along the gradient
 * (thin edges) above a threshold set from the strongest edges in the frame.
 * `nx, ny` point towards brighter pixels.
 */
function collectEdgePoints(img: FloatImage): EdgePoints {
  const { data, width: w, height: h } = img;
  const mag = new Float32Array(w * h);
  const gxs = new Float32Array(w * h);
  const gys = new Float32Array(w * h);
  let maxMag = 0;
  for (let y = 1; y < h - 1; y += 1) {
    for (let x = 1; x < w - 1; x += 1) {
      const i = y * w + x;
      const tl = data[i - w - 1]!,
        t = data[i - w]!,
        tr = data[i - w + 1]!;
      const l = data[i - 1]!,
        r = data[i + 1]!;
      const bl = data[i + w - 1]!,
        b = data[i + w]!,
        br = data[i + w + 1]!;
      const gx = tr + 2 * r + br - tl - 2 * l - bl;
      const gy = bl + 2 * b + br - tl - 2 * t - tr;
      const m = Math.hypot(gx, gy);
      mag[i] = m;
      gxs[i] = gx;
      gys[i] = gy;
      if (m > maxMag) maxMag = m;
    }
  }
  // Threshold from the 99.5th percentile of the magnitude (a histogram, not a sort).
  const bins = 1024;
  const hist = new Uint32Array(bins);
  const scale = maxMag > 0 ? (bins - 1) / maxMag : 0;
  for (let i = 0; i < mag.length; i += 1) hist[Math.floor(mag[i]! * scale)]! += 1;
  let seen = 0;
  let p995 = maxMag;
  for (let b = bins - 1; b >= 0; b -= 1) {
    seen += hist[b]!;
    if (seen >= mag.length * 0.005) {
      p995 = b / scale;
      break;
    }
  }
  const threshold = 0.3 * p995;
  const cap = 8000;
  const xs = new Float32Array(cap);
  const ys = new Float32Array(cap);
  const nx = new Float32Array(cap);
  const ny = new Float32Array(cap);
  const magnitude = { data: mag, width: w, height: h };
  let count = 0;
  let candidates = 0;
  for (let i = 0; i < mag.length; i += 1) if (mag[i]! >= threshold) candidates += 1;
  const stride = Math.max(1, Math.ceil(candidates / (cap * 2)));
  let k = 0;
  for (let y = 2; y < h - 2 && count < cap; y += 1) {
    for (let x = 2; x < w - 2 && count < cap; x += 1) {
      const i = y * w + x;
      const m = mag[i]!;
      if (m < threshold) continue;
      const ux = gxs[i]! / m;
      const uy = gys[i]! / m;
      // Non-maximum suppression along the gradient.
      const ahead = sampleBilinear(magnitude, x + ux, y + uy);
      const behind = sampleBilinear(magnitude, x - ux, y - uy);
      if (m < ahead || m < behind) continue;
      k += 1;
      if (k % stride !== 0) continue;
      xs[count] = x;
      ys[count] = y;
      nx[count] = ux;
      ny[count] = uy;
      count += 1;
    }
  }
  return { xs, ys, nx, ny, count };
}

// ------------------------------------------------------------ full-resolution rays

function refineOnRays({ image, start, bandPx }: { image: GrayImage; start: Circle; bandPx: number }) {
  const rays = Math.min(1440, Math.max(360, Math.round((2 * Math.PI * start.r) / 6)));
  const step = 0.5;
  const samples = Math.ceil((2 * bandPx) / step) + 1;
  const profile = new Float32Array(samples);
  const smooth = new Float32Array(samples);
  // Smoothing width grows with the blur one expects at this scale.
  const half = Math.max(2, Math.round(Math.max(1, start.r / 400) / step));
  const xs: number[] = [];
  const ys: number[] = [];
  const steps: number[] = [];
  const angles: number[] = [];
  for (let k = 0; k < rays; k += 1) {
    const angle = (2 * Math.PI * k) / rays;
    const ux = Math.cos(angle);
    const uy = Math.sin(angle);
    const r0 = start.r - bandPx;
    let inside = true;
    for (let s = 0; s < samples; s += 1) {
      const r = r0 + s * step;
      const v = sampleBilinear(image, start.cx + r * ux, start.cy + r * uy);
      if (Number.isNaN(v)) {
        inside = false;
        break;
      }
      profile[s] = v;
    }
    if (!inside) continue; // the limb leaves the frame here
    boxSmooth(profile, smooth, half);
    let best = 0;
    let bestAt = -1;
    for (let s = half + 1; s < samples - half - 1; s += 1) {
      const slope = smooth[s + 1]! - smooth[s - 1]!;
      if (slope < best) {
        best = slope;
        bestAt = s;
      }
    }
    if (bestAt < 0) continue;
    // Sub-sample position from a parabola through the slope minimum and its neighbours.
    const sm = smooth[bestAt]! - smooth[bestAt - 2]!;
    const sp = smooth[bestAt + 2]! - smooth[bestAt]!;
    const denom = sm - 2 * best + sp;
    const offset = denom !== 0 ? Math.max(-1, Math.min(1, (0.5 * (sm - sp)) / denom)) : 0;
    const r = r0 + (bestAt + offset) * step;
    // Step height: the mean just inside minus the mean just outside the edge.
    const gap = 2 * half;
    const inner = meanOf(smooth, Math.max(0, bestAt - 3 * gap), Math.max(1, bestAt - gap));
    const outer = meanOf(smooth, Math.min(samples - 1, bestAt + gap), Math.min(samples, bestAt + 3 * gap));
    xs.push(start.cx + r * ux);
    ys.push(start.cy + r * uy);
    steps.push(inner - outer);
    angles.push(k);
  }
  if (xs.length < 12) return null;
  // A clouded limb shows a much weaker step: keep the rays whose step is at least a third of the typical one.
  const typical = medianOf(steps);
  const keepX: number[] = [];
  const keepY: number[] = [];
  for (let i = 0; i < xs.length; i += 1) {
    if (steps[i]! > 0.33 * typical) {
      keepX.push(xs[i]!);
      keepY.push(ys[i]!);
    }
  }
  if (keepX.length < 12) return null;
  const trimmed = fitCircleTrimmed({ xs: keepX, ys: keepY, start });
  if (!trimmed) return null;
  let used = 0;
  for (let i = 0; i < trimmed.keep.length; i += 1) used += trimmed.keep[i]!;
  return { circle: trimmed.circle, used, rays, coverage: used / rays, rmsPx: trimmed.rmsPx };
}

function boxSmooth(input: Float32Array, output: Float32Array, half: number) {
  const n = input.length;
  let sum = 0;
  let count = 0;
  for (let i = 0; i < Math.min(half, n); i += 1) {
    sum += input[i]!;
    count += 1;
  }
  for (let i = 0; i < n; i += 1) {
    const add = i + half;
    if (add < n) {
      sum += input[add]!;
      count += 1;
    }
    const drop = i - half - 1;
    if (drop >= 0) {
      sum -= input[drop]!;
      count -= 1;
    }
    output[i] = sum / count;
  }
}

function meanOf(values: Float32Array, from: number, to: number): number {
  let sum = 0;
  let count = 0;
  for (let i = Math.max(0, from); i < Math.min(values.length, to); i += 1) {
    sum += values[i]!;
    count += 1;
  }
  return count ? sum / count : 0;
}
