/**
 * Circle fits for limb points: the algebraic fit (Kåsa 1976) as a start,
 * Gauss–Newton on the geometric distances to finish, and a trimmed loop
 * that drops outliers by the median absolute deviation (common practice).
 */
import { medianOf } from "./gray";

export type Circle = { cx: number; cy: number; r: number };

/** Least squares of x² + y² + Dx + Ey + F = 0. Null when the points are degenerate. */
export function fitCircleAlgebraic({
  xs,
  ys,
  weights,
}: {
  xs: ArrayLike<number>;
  ys: ArrayLike<number>;
  weights?: ArrayLike<number>;
}): Circle | null {
  const n = xs.length;
  if (n < 3) return null;
  // Centre the data first so the normal equations stay well conditioned.
  let mx = 0;
  let my = 0;
  for (let i = 0; i < n; i += 1) {
    mx += xs[i]!;
    my += ys[i]!;
  }
  mx /= n;
  my /= n;
  let sxx = 0,
    sxy = 0,
    syy = 0,
    sxz = 0,
    syz = 0,
    sz = 0,
    sw = 0,
    sx = 0,
    sy = 0;
  for (let i = 0; i < n; i += 1) {
    const w = weights ? weights[i]! : 1;
    if (w <= 0) continue;
    const x = xs[i]! - mx;
    const y = ys[i]! - my;
    const z = x * x + y * y;
    sxx += w * x * x;
    sxy += w * x * y;
    syy += w * y * y;
    sxz += w * x * z;
    syz += w * y * z;
    sz += w * z;
    sx += w * x;
    sy += w * y;
    sw += w;
  }
  if (sw < 3) return null;
  // Solve [sxx sxy sx; sxy syy sy; sx sy sw] [D E F]ᵀ = −[sxz syz sz]ᵀ by Cramer's rule.
  const det = sxx * (syy * sw - sy * sy) - sxy * (sxy * sw - sy * sx) + sx * (sxy * sy - syy * sx);
  if (!Number.isFinite(det) || Math.abs(det) < 1e-12) return null;
  const bx = -sxz;
  const by = -syz;
  const bz = -sz;
  const D = (bx * (syy * sw - sy * sy) - sxy * (by * sw - sy * bz) + sx * (by * sy - syy * bz)) / det;
  const E = (sxx * (by * sw - sy * bz) - bx * (sxy * sw - sy * sx) + sx * (sxy * bz - by * sx)) / det;
  const F = (sxx * (syy * bz - by * sy) - sxy * (sxy * bz - by * sx) + bx * (sxy * sy - syy * sx)) / det;
  const cx = -D / 2;
  const cy = -E / 2;
  const r2 = cx * cx + cy * cy - F;
  if (!(r2 > 0)) return null;
  return { cx: cx + mx, cy: cy + my, r: Math.sqrt(r2) };
}

/** The circle through three points, or null when they are (nearly) in a line. */
export function circleThroughPoints(
  x1: number,
  y1: number,
  x2: number,
  y2: number,
  x3: number,
  y3: number,
): Circle | null {
  const ax = x2 - x1;
  const ay = y2 - y1;
  const bx = x3 - x1;
  const by = y3 - y1;
  const d = 2 * (ax * by - ay * bx);
  if (Math.abs(d) < 1e-9) return null;
  const a2 = ax * ax + ay * ay;
  const b2 = bx * bx + by * by;
  const ux = (by * a2 - ay * b2) / d;
  const uy = (ax * b2 - bx * a2) / d;
  return { cx: x1 + ux, cy: y1 + uy, r: Math.sqrt(ux * ux + uy * uy) };
}

/** Gauss–Newton on Σ(|p − c| − r)², started from `start`. */
export function refineCircleGeometric({
  xs,
  ys,
  start,
  keep,
  iterations = 8,
}: {
  xs: ArrayLike<number>;
  ys: ArrayLike<number>;
  start: Circle;
  keep?: Uint8Array;
  iterations?: number;
}): Circle {
  let { cx, cy, r } = start;
  for (let it = 0; it < iterations; it += 1) {
    // Normal equations JᵀJ δ = −Jᵀres for (cx, cy, r).
    let a11 = 0,
      a12 = 0,
      a13 = 0,
      a22 = 0,
      a23 = 0,
      a33 = 0,
      g1 = 0,
      g2 = 0,
      g3 = 0;
    for (let i = 0; i < xs.length; i += 1) {
      if (keep && !keep[i]) continue;
      const dx = xs[i]! - cx;
      const dy = ys[i]! - cy;
      const d = Math.hypot(dx, dy);
      if (d < 1e-9) continue;
      const j1 = -dx / d;
      const j2 = -dy / d;
      const res = d - r;
      a11 += j1 * j1;
      a12 += j1 * j2;
      a13 -= j1;
      a22 += j2 * j2;
      a23 -= j2;
      a33 += 1;
      g1 += j1 * res;
      g2 += j2 * res;
      g3 -= res;
    }
    const det = a11 * (a22 * a33 - a23 * a23) - a12 * (a12 * a33 - a23 * a13) + a13 * (a12 * a23 - a22 * a13);
    if (!Number.isFinite(det) || Math.abs(det) < 1e-12) break;
    const b1 = -g1;
    const b2 = -g2;
    const b3 = -g3;
    const d1 =
      (b1 * (a22 * a33 - a23 * a23) - a12 * (b2 * a33 - a23 * b3) + a13 * (b2 * a23 - a22 * b3)) / det;
    const d2 =
      (a11 * (b2 * a33 - a23 * b3) - b1 * (a12 * a33 - a23 * a13) + a13 * (a12 * b3 - b2 * a13)) / det;
    const d3 =
      (a11 * (a22 * b3 - b2 * a23) - a12 * (a12 * b3 - b2 * a13) + b1 * (a12 * a23 - a22 * a13)) / det;
    cx += d1;
    cy += d2;
    r += d3;
    if (Math.abs(d1) + Math.abs(d2) + Math.abs(d3) < 1e-4) break;
  }
  return { cx, cy, r };
}

/**
 * Fits, drops points further than `k` robust sigmas (1.4826 × MAD) from the
 * circle, and fits again until nothing more is dropped.
 */
export function fitCircleTrimmed({
  xs,
  ys,
  start,
  k = 3,
  minSigmaPx = 0.35,
  rounds = 5,
}: {
  xs: ArrayLike<number>;
  ys: ArrayLike<number>;
  start?: Circle;
  k?: number;
  minSigmaPx?: number;
  rounds?: number;
}): { circle: Circle; keep: Uint8Array; rmsPx: number } | null {
  const n = xs.length;
  const keep = new Uint8Array(n).fill(1);
  let circle = start ?? fitCircleAlgebraic({ xs, ys });
  if (!circle) return null;
  const residuals = new Float64Array(n);
  for (let round = 0; round < rounds; round += 1) {
    circle = refineCircleGeometric({ xs, ys, start: circle, keep });
    const kept: number[] = [];
    for (let i = 0; i < n; i += 1) {
      residuals[i] = Math.hypot(xs[i]! - circle.cx, ys[i]! - circle.cy) - circle.r;
      if (keep[i]) kept.push(residuals[i]!);
    }
    const median = medianOf(kept);
    const sigma = Math.max(minSigmaPx, 1.4826 * medianOf(kept.map((v) => Math.abs(v - median))));
    let changed = 0;
    for (let i = 0; i < n; i += 1) {
      // Judged afresh each round: a point dropped against an early, worse circle may belong after all.
      const inside = Math.abs(residuals[i]! - median) <= k * sigma ? 1 : 0;
      if (inside !== keep[i]) changed += 1;
      keep[i] = inside;
    }
    if (changed === 0) break;
  }
  let sum = 0;
  let count = 0;
  for (let i = 0; i < n; i += 1) {
    if (!keep[i]) continue;
    const res = Math.hypot(xs[i]! - circle.cx, ys[i]! - circle.cy) - circle.r;
    sum += res * res;
    count += 1;
  }
  if (count < 3) return null;
  return { circle, keep, rmsPx: Math.sqrt(sum / count) };
}
