/**
 * Proposes dark features inside a fitted disk as candidate spots. Nothing
 * here counts anything: the observer accepts, rejects or edits each one.
 *
 * 1. The disk is flattened (disk-flatten.ts): limb darkening and the coarse
 *    local background (cloud, uneven light) are divided out.
 * 2. The noise is measured in brightness units, so a dip must be deeper
 *    where the disk is dim (near the limb, under a cloud) to count.
 * 3. Pixels clearly darker than their surroundings seed a candidate; each
 *    grows over neighbours that are darker by a smaller margin (hysteresis),
 *    which takes in most of the penumbra.
 */
import {
  downsampleGray,
  medianOf,
  toFull,
  toSmall,
  type FloatImage,
  type GrayImage,
  type ProgressFn,
} from "./gray";
import { flattenDisk } from "./disk-flatten";
import type { LimbFit } from "./limb-fit";

export type SpotCandidate = {
  id: string;
  /** Centre in photo pixels (darkness-weighted). */
  xPx: number;
  yPx: number;
  areaPx: number;
  /** Radius of a circle with the same area. */
  radiusPx: number;
  /** Darkest point relative to its surroundings: 0 (as bright) to 1 (black). */
  depth: number;
  /** Whether part of it is dark enough to be an umbra (below half the surroundings). */
  hasUmbra: boolean;
  /** Distance from the disk centre as a fraction of the radius. */
  radialFraction: number;
  /** Area in millionths of the solar hemisphere, corrected for foreshortening. */
  areaMsh: number;
};

export type SpotOptions = {
  /** Smallest area reported, in photo pixels; default ~ a spot 0.35 % of the radius across. */
  minAreaPx?: number;
  /** Candidates further out than this fraction of the radius are left out (the limb itself is too dark and noisy). */
  maxRadialFraction?: number;
  /** Most candidates returned (the darkest first). */
  maxCandidates?: number;
};

const WORK_RADIUS_PX = 620;

export function findSpotCandidates({
  image,
  limb,
  options = {},
  onProgress,
  reduced,
}: {
  image: GrayImage;
  limb: Pick<LimbFit, "centreXPx" | "centreYPx" | "radiusPx">;
  options?: SpotOptions;
  onProgress?: ProgressFn;
  reduced?: { image: FloatImage; factor: number };
}): SpotCandidate[] {
  // Work with the disk about WORK_RADIUS_PX across its radius: enough for the smallest spot reported, and fast.
  const usable =
    reduced &&
    limb.radiusPx / reduced.factor >= 0.55 * WORK_RADIUS_PX &&
    limb.radiusPx / reduced.factor <= 1.6 * WORK_RADIUS_PX;
  const factor = usable ? reduced.factor : Math.max(1, Math.round(limb.radiusPx / WORK_RADIUS_PX));
  const work = usable ? reduced.image : downsampleGray({ image, factor });
  const cx = toSmall(limb.centreXPx, factor);
  const cy = toSmall(limb.centreYPx, factor);
  const r = limb.radiusPx / factor;
  const maxFraction = options.maxRadialFraction ?? 0.96;
  const minAreaPx = options.minAreaPx ?? Math.max(4, Math.PI * (0.0035 * limb.radiusPx) ** 2);
  onProgress?.({ stage: "spots", fraction: 0.1 });

  const { width: w, height: h } = work;
  const x0 = Math.max(0, Math.floor(cx - r));
  const x1 = Math.min(w - 1, Math.ceil(cx + r));
  const y0 = Math.max(0, Math.floor(cy - r));
  const y1 = Math.min(h - 1, Math.ceil(cy + r));

  const box = { x0, x1, y0, y1 };
  const { flat: removed, level } = flattenDisk({ work, cx, cy, r, box });
  onProgress?.({ stage: "spots", fraction: 0.7 });

  // Noise in brightness units (median absolute deviation from the model, on a sparse grid). Thresholds are
  // set per pixel from it, so the dim disk near the limb or under a cloud needs a deeper dip to count.
  const residuals: number[] = [];
  const gridStep = Math.max(3, Math.round(r / 80));
  for (let y = y0; y <= y1; y += gridStep) {
    for (let x = x0; x <= x1; x += gridStep) {
      const i = y * w + x;
      if (removed[i]! > 0) residuals.push(work.data[i]! - level[i]!);
    }
  }
  const centre = medianOf(residuals);
  const noise = 1.4826 * medianOf(residuals.map((v) => Math.abs(v - centre))) || 1;

  const candidates = labelDarkRegions({
    removed,
    level,
    noise,
    w,
    x0,
    x1,
    y0,
    y1,
    cx,
    cy,
    r,
    maxFraction,
  });
  onProgress?.({ stage: "spots", fraction: 1 });

  const out: SpotCandidate[] = [];
  for (const c of candidates) {
    const areaPx = c.count * factor * factor;
    if (areaPx < minAreaPx) continue;
    const xPx = toFull(c.sumX / c.sumW, factor);
    const yPx = toFull(c.sumY / c.sumW, factor);
    const radialFraction = Math.hypot(xPx - limb.centreXPx, yPx - limb.centreYPx) / limb.radiusPx;
    const mu = Math.sqrt(Math.max(0.05, 1 - radialFraction * radialFraction));
    out.push({
      id: `c${out.length + 1}`,
      xPx,
      yPx,
      areaPx,
      radiusPx: Math.sqrt(areaPx / Math.PI),
      depth: 1 - c.darkest,
      hasUmbra: c.darkest < 0.5,
      radialFraction,
      areaMsh: (areaPx / (2 * Math.PI * limb.radiusPx * limb.radiusPx) / mu) * 1e6,
    });
  }
  out.sort((a, b) => b.depth * b.areaPx - a.depth * a.areaPx);
  const limited = out.slice(0, options.maxCandidates ?? 200);
  return limited.map((c, i) => ({ ...c, id: `c${i + 1}` }));
}

type Region = { count: number; sumX: number; sumY: number; sumW: number; darkest: number };

/** Hysteresis labelling, 8-connected, inside `maxFraction` of the radius. */
function labelDarkRegions({
  removed,
  level,
  noise,
  w,
  x0,
  x1,
  y0,
  y1,
  cx,
  cy,
  r,
  maxFraction,
}: {
  removed: Float32Array;
  level: Float32Array;
  noise: number;
  w: number;
  x0: number;
  x1: number;
  y0: number;
  y1: number;
  cx: number;
  cy: number;
  r: number;
  maxFraction: number;
}): Region[] {
  const limit2 = (maxFraction * r) ** 2;
  const visited = new Uint8Array(removed.length);
  const stack = new Int32Array(removed.length > 1 << 22 ? 1 << 22 : removed.length);
  const regions: Region[] = [];
  // Seeds: at least 12 % darker than the surroundings and 6 noise sigmas; growth: 6 % and 3 sigmas.
  const seed = (i: number) => removed[i]! > 0 && removed[i]! < 1 - Math.max(0.12, (6 * noise) / level[i]!);
  const dark = (i: number, x: number, y: number) => {
    const v = removed[i]!;
    if (v <= 0 || v >= 1 - Math.max(0.06, (3 * noise) / level[i]!)) return false;
    const dx = x - cx;
    const dy = y - cy;
    return dx * dx + dy * dy < limit2;
  };
  for (let y = y0; y <= y1; y += 1) {
    for (let x = x0; x <= x1; x += 1) {
      const start = y * w + x;
      if (visited[start] || !seed(start) || !dark(start, x, y)) continue;
      const region: Region = { count: 0, sumX: 0, sumY: 0, sumW: 0, darkest: 1 };
      let top = 0;
      stack[top++] = start;
      visited[start] = 1;
      while (top > 0) {
        const i = stack[--top]!;
        const px = i % w;
        const py = (i - px) / w;
        const value = removed[i]!;
        const weight = 1 - value;
        region.count += 1;
        region.sumX += px * weight;
        region.sumY += py * weight;
        region.sumW += weight;
        if (value < region.darkest) region.darkest = value;
        for (let oy = -1; oy <= 1; oy += 1) {
          const ny = py + oy;
          if (ny < y0 || ny > y1) continue;
          for (let ox = -1; ox <= 1; ox += 1) {
            const nx = px + ox;
            if (nx < x0 || nx > x1 || (ox === 0 && oy === 0)) continue;
            const j = ny * w + nx;
            if (visited[j] || !dark(j, nx, ny)) continue;
            visited[j] = 1;
            if (top < stack.length) stack[top++] = j;
          }
        }
      }
      regions.push(region);
    }
  }
  return regions;
}
