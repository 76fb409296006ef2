/**
 * Fitting the solar limb: the circle through three or more points clicked on
 * the edge of the projected disk.
 *
 * Least squares in two steps: the algebraic fit of I. Kåsa (1976, "A circle
 * fitting procedure and its error analysis", IEEE Trans. Instrum. Meas. 25,
 * 8) gives a starting circle in closed form, then Gauss–Newton iterations
 * minimise the sum of squared geometric distances from the points to the
 * circle (the "geometric fit", N. Chernov 2010, "Circular and Linear
 * Regression", ch. 4). Both references are cited from memory. Kåsa alone is
 * biased towards small circles when the points cover a short arc; the
 * geometric step removes that bias.
 */

export type PlanePoint = { x: number; y: number };
export type FittedCircle = { cx: number; cy: number; r: number; rmsResidual: number };

export type CircleFitResult =
  { ok: true; circle: FittedCircle } | { ok: false; reason: "too-few" | "collinear"; message: string };

/** Points closer than this (relative to their spread) count as one click. */
const DUPLICATE_TOLERANCE = 1e-9;
/**
 * Below this ratio of the points' narrow to wide spread the points lie on a
 * line for practical purposes: a 2° arc of a circle is already at 0.0045.
 */
const COLLINEAR_RATIO = 1e-3;
const MAX_ITERATIONS = 50;

function solve3({ a, b }: { a: number[][]; b: number[] }): number[] | null {
  // Cramer's rule: three unknowns, so the determinant is cheap and its size tells us about degeneracy.
  const [r0, r1, r2] = a as [number[], number[], number[]];
  const det = (m: number[][]) => {
    const [p, q, s] = m as [number[], number[], number[]];
    return (
      p[0]! * (q[1]! * s[2]! - q[2]! * s[1]!) -
      p[1]! * (q[0]! * s[2]! - q[2]! * s[0]!) +
      p[2]! * (q[0]! * s[1]! - q[1]! * s[0]!)
    );
  };
  const d = det([r0, r1, r2]);
  if (!Number.isFinite(d) || Math.abs(d) < 1e-300) return null;
  const replace = (col: number) => [r0, r1, r2].map((row, i) => row.map((v, j) => (j === col ? b[i]! : v)));
  return [det(replace(0)) / d, det(replace(1)) / d, det(replace(2)) / d];
}

function countDistinct(points: PlanePoint[], tolerance: number): number {
  const kept: PlanePoint[] = [];
  for (const p of points) {
    if (!kept.some((q) => Math.hypot(p.x - q.x, p.y - q.y) <= tolerance)) kept.push(p);
  }
  return kept.length;
}

/** Fits a circle to limb points; refuses fewer than three distinct points or points on a line. */
export function fitCircle({ points }: { points: PlanePoint[] }): CircleFitResult {
  const finite = points.filter((p) => Number.isFinite(p.x) && Number.isFinite(p.y));
  const n = finite.length;
  const meanX = finite.reduce((s, p) => s + p.x, 0) / Math.max(n, 1);
  const meanY = finite.reduce((s, p) => s + p.y, 0) / Math.max(n, 1);
  const spread = Math.max(1e-300, ...finite.map((p) => Math.hypot(p.x - meanX, p.y - meanY)));
  if (n < 3 || countDistinct(finite, spread * DUPLICATE_TOLERANCE) < 3) {
    return {
      ok: false,
      reason: "too-few",
      message: `Click at least three different points on the limb to fit the disk (${countDistinct(finite, spread * DUPLICATE_TOLERANCE)} so far).`,
    };
  }

  // Work in centred, scaled coordinates so the normal equations stay well conditioned.
  const u = finite.map((p) => ({ x: (p.x - meanX) / spread, y: (p.y - meanY) / spread }));
  let sxx = 0;
  let syy = 0;
  let sxy = 0;
  for (const p of u) {
    sxx += p.x * p.x;
    syy += p.y * p.y;
    sxy += p.x * p.y;
  }
  const trace = sxx + syy;
  const root = Math.sqrt(((sxx - syy) / 2) ** 2 + sxy * sxy);
  const wide = trace / 2 + root;
  const narrow = trace / 2 - root;
  if (!(Math.sqrt(Math.max(narrow, 0) / wide) >= COLLINEAR_RATIO)) {
    return {
      ok: false,
      reason: "collinear",
      message:
        "The limb points lie on a straight line, so no circle fits them. Spread the points around the edge of the disk.",
    };
  }

  // Kåsa: minimise Σ (x² + y² + D x + E y + F)², linear in D, E, F.
  let sx = 0;
  let sy = 0;
  let sz = 0;
  let sxz = 0;
  let syz = 0;
  for (const p of u) {
    const z = p.x * p.x + p.y * p.y;
    sx += p.x;
    sy += p.y;
    sz += z;
    sxz += p.x * z;
    syz += p.y * z;
  }
  const kasa = solve3({
    a: [
      [sxx, sxy, sx],
      [sxy, syy, sy],
      [sx, sy, n],
    ],
    b: [-sxz, -syz, -sz],
  });
  if (!kasa) {
    return {
      ok: false,
      reason: "collinear",
      message: "The limb points lie on a straight line, so no circle fits them.",
    };
  }
  const [dCoef, eCoef, fCoef] = kasa as [number, number, number];
  let cx = -dCoef / 2;
  let cy = -eCoef / 2;
  let r = Math.sqrt(Math.max(cx * cx + cy * cy - fCoef, 0));

  // Gauss–Newton on the geometric distances |p − c| − r.
  for (let iteration = 0; iteration < MAX_ITERATIONS; iteration += 1) {
    const jtj = [
      [0, 0, 0],
      [0, 0, 0],
      [0, 0, 0],
    ] as [number[], number[], number[]];
    const jtr = [0, 0, 0];
    for (const p of u) {
      const dx = p.x - cx;
      const dy = p.y - cy;
      const d = Math.hypot(dx, dy);
      if (d === 0) continue;
      const row = [-dx / d, -dy / d, -1];
      const residual = d - r;
      for (let i = 0; i < 3; i += 1) {
        jtr[i]! += row[i]! * residual;
        for (let j = 0; j < 3; j += 1) jtj[i]![j]! += row[i]! * row[j]!;
      }
    }
    const step = solve3({ a: jtj, b: jtr.map((v) => -v) });
    if (!step) break;
    cx += step[0]!;
    cy += step[1]!;
    r += step[2]!;
    if (Math.hypot(step[0]!, step[1]!, step[2]!) < 1e-14) break;
  }
  r = Math.abs(r);

  const rms = Math.sqrt(u.reduce((s, p) => s + (Math.hypot(p.x - cx, p.y - cy) - r) ** 2, 0) / n);
  return {
    ok: true,
    circle: { cx: meanX + cx * spread, cy: meanY + cy * spread, r: r * spread, rmsResidual: rms * spread },
  };
}
