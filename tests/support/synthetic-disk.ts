/**
 * Synthetic disk photos with known answers, for the photo analysis tests and
 * the benchmark: a limb-darkened disk (linear law I = 1 − u(1 − μ), common
 * practice; u ≈ 0.6 for the eye's visible band), an uneven background, a
 * soft cloud, Gaussian noise and planted spots (a dark umbra inside a
 * lighter penumbra), all from a seeded generator so every run is the same.
 */
import { makeRandom } from "@/lib/photo/gray";

export type PlantedSpot = { xPx: number; yPx: number; radiusPx: number; umbraFraction?: number };
export type Cloud = {
  xPx: number;
  yPx: number;
  radiusPx: number;
  /** fraction of light taken away at its core */ opacity: number;
};

export type SyntheticDiskOptions = {
  width: number;
  height: number;
  centreXPx: number;
  centreYPx: number;
  radiusPx: number;
  /** Linear limb-darkening coefficient. */
  limbDarkening?: number;
  /** Brightness at disk centre (0–255). */
  diskLevel?: number;
  /** Background at the left and right edges (a gradient across the frame). */
  backgroundLeft?: number;
  backgroundRight?: number;
  noiseSigma?: number;
  spots?: PlantedSpot[];
  clouds?: Cloud[];
  /** Edge blur (px), as seeing and focus give. */
  edgeBlurPx?: number;
  seed?: number;
};

export function makeSyntheticDisk(o: SyntheticDiskOptions): {
  data: Uint8Array;
  width: number;
  height: number;
} {
  const {
    width,
    height,
    centreXPx: cx,
    centreYPx: cy,
    radiusPx: R,
    limbDarkening: u = 0.6,
    diskLevel = 210,
    backgroundLeft = 25,
    backgroundRight = 60,
    noiseSigma = 4,
    spots = [],
    clouds = [],
    edgeBlurPx = 1.2,
    seed = 1,
  } = o;
  const random = makeRandom(seed);
  const data = new Uint8Array(width * height);
  // Box–Muller pairs from a fixed table keep 16 M pixels fast: reuse 64 K normals with a random offset per row.
  const normals = new Float32Array(65536);
  for (let i = 0; i < normals.length; i += 2) {
    const a = Math.max(1e-12, random());
    const b = random();
    const m = Math.sqrt(-2 * Math.log(a));
    normals[i] = m * Math.cos(2 * Math.PI * b);
    normals[i + 1] = m * Math.sin(2 * Math.PI * b);
  }
  for (let y = 0; y < height; y += 1) {
    const dy = y - cy;
    let n = Math.floor(random() * 65536);
    for (let x = 0; x < width; x += 1) {
      const dx = x - cx;
      const d = Math.sqrt(dx * dx + dy * dy);
      const background = backgroundLeft + ((backgroundRight - backgroundLeft) * x) / (width - 1);
      // Coverage of the disk edge: a smooth ramp over ±edgeBlur.
      const coverage = d < R - edgeBlurPx ? 1 : d > R + edgeBlurPx ? 0 : 0.5 - (d - R) / (2 * edgeBlurPx);
      let value = background;
      if (coverage > 0) {
        const rr = Math.min(1, d / R);
        const mu = Math.sqrt(1 - rr * rr);
        let disk = diskLevel * (1 - u * (1 - mu));
        for (const s of spots) {
          const sd = Math.hypot(x - s.xPx, y - s.yPx);
          if (sd > s.radiusPx + 1) continue;
          const umbraR = s.radiusPx * (s.umbraFraction ?? 0.45);
          // Soft edges over ~1 px.
          const inPenumbra = Math.min(1, Math.max(0, s.radiusPx + 0.5 - sd));
          const inUmbra = Math.min(1, Math.max(0, umbraR + 0.5 - sd));
          disk *= 1 - 0.3 * inPenumbra - 0.5 * inUmbra;
        }
        value = background * (1 - coverage) + (background * 0.3 + disk) * coverage;
      }
      for (const c of clouds) {
        const cd = Math.hypot(x - c.xPx, y - c.yPx) / c.radiusPx;
        if (cd < 1.6) value *= 1 - c.opacity * Math.exp(-cd * cd * 1.5);
      }
      value += noiseSigma * normals[n]!;
      n = (n + 1) & 65535;
      data[y * width + x] = value < 0 ? 0 : value > 255 ? 255 : Math.round(value);
    }
  }
  return { data, width, height };
}
