/**
 * Limb fit and spot candidates on synthetic disk photos with known answers
 * (tests/support/synthetic-disk.ts). What the analysis promises:
 * - centre and radius within 0.5 % of the radius;
 * - every planted spot at least 0.5 % of the radius across (radius ≥ 0.0025 R,
 *   here ≥ 3 px) proposed, near its true place and with about its true size;
 * - at most 2 false candidates per photo.
 */
import { describe, expect, it } from "vitest";

import { analysePhoto, type PhotoAnalysis } from "@/lib/photo/analyse";
import { fitCircleTrimmed } from "@/lib/photo/circle-fit";
import { findSpotCandidates } from "@/lib/photo/spot-candidates";

import { makeSyntheticDisk, type PlantedSpot, type SyntheticDiskOptions } from "../../support/synthetic-disk";

const MAX_FALSE_CANDIDATES = 2;

function expectLimbWithin({
  analysis,
  truth,
  tolerance = 0.005,
}: {
  analysis: PhotoAnalysis;
  truth: SyntheticDiskOptions;
  tolerance?: number;
}) {
  const limb = analysis.limb;
  expect(limb).not.toBeNull();
  const allowed = tolerance * truth.radiusPx;
  expect(Math.abs(limb!.centreXPx - truth.centreXPx)).toBeLessThan(allowed);
  expect(Math.abs(limb!.centreYPx - truth.centreYPx)).toBeLessThan(allowed);
  expect(Math.abs(limb!.radiusPx - truth.radiusPx)).toBeLessThan(allowed);
}

function matchSpots({ analysis, spots }: { analysis: PhotoAnalysis; spots: PlantedSpot[] }) {
  const near = (c: { xPx: number; yPx: number }, s: PlantedSpot) =>
    Math.hypot(c.xPx - s.xPx, c.yPx - s.yPx) < s.radiusPx + 3;
  const missed = spots.filter((s) => !analysis.candidates.some((c) => near(c, s)));
  const falses = analysis.candidates.filter((c) => !spots.some((s) => near(c, s)));
  return { missed, falses };
}

const SPOTS: PlantedSpot[] = [
  { xPx: 500, yPx: 480, radiusPx: 12 },
  { xPx: 620, yPx: 400, radiusPx: 6 },
  { xPx: 380, yPx: 620, radiusPx: 4 },
  { xPx: 700, yPx: 650, radiusPx: 8 },
  { xPx: 300, yPx: 300, radiusPx: 3 },
  { xPx: 760, yPx: 360, radiusPx: 5 }, // at 0.74 R, where limb darkening is strong
];

const CASES: Array<{ name: string; options: SyntheticDiskOptions }> = [
  {
    name: "a clear disk on an uneven background",
    options: { width: 1000, height: 1000, centreXPx: 512.3, centreYPx: 497.8, radiusPx: 400, spots: SPOTS },
  },
  {
    name: "a cloud over part of the disk and its limb",
    options: {
      width: 1000,
      height: 1000,
      centreXPx: 512.3,
      centreYPx: 497.8,
      radiusPx: 400,
      spots: SPOTS,
      clouds: [{ xPx: 200, yPx: 700, radiusPx: 300, opacity: 0.6 }],
      seed: 2,
    },
  },
  {
    name: "a limb cut off by the frame on two sides",
    options: {
      width: 1000,
      height: 800,
      centreXPx: 560,
      centreYPx: 470,
      radiusPx: 420,
      spots: SPOTS,
      seed: 3,
    },
  },
  {
    name: "nearly half the disk outside the frame",
    options: {
      width: 1000,
      height: 600,
      centreXPx: 500.5,
      centreYPx: 560.3,
      radiusPx: 450,
      spots: [{ xPx: 520, yPx: 300, radiusPx: 8 }],
      seed: 6,
    },
  },
  {
    name: "a thick cloud (85 % of the light) over part of the limb",
    options: {
      width: 1000,
      height: 1000,
      centreXPx: 480,
      centreYPx: 520,
      radiusPx: 400,
      clouds: [{ xPx: 800, yPx: 300, radiusPx: 350, opacity: 0.85 }],
      spots: [{ xPx: 400, yPx: 600, radiusPx: 8 }],
      seed: 7,
    },
  },
  {
    name: "heavy noise and strong limb darkening",
    options: {
      width: 1200,
      height: 900,
      centreXPx: 610.6,
      centreYPx: 440.2,
      radiusPx: 380,
      noiseSigma: 10,
      limbDarkening: 0.8,
      spots: [
        { xPx: 600, yPx: 400, radiusPx: 10 },
        { xPx: 500, yPx: 520, radiusPx: 5 },
        { xPx: 760, yPx: 300, radiusPx: 7 },
      ],
      seed: 4,
    },
  },
  {
    name: "a small, dim disk with a steep background gradient",
    options: {
      width: 640,
      height: 480,
      centreXPx: 330.7,
      centreYPx: 250.1,
      radiusPx: 190,
      diskLevel: 120,
      backgroundLeft: 10,
      backgroundRight: 50,
      noiseSigma: 3,
      spots: [
        { xPx: 300, yPx: 220, radiusPx: 6 },
        { xPx: 400, yPx: 300, radiusPx: 4 },
      ],
      seed: 5,
    },
  },
];

describe("limb fit and spot candidates on synthetic disk photos", () => {
  for (const { name, options } of CASES) {
    it(name, () => {
      const analysis = analysePhoto({ image: makeSyntheticDisk(options) });
      expectLimbWithin({ analysis, truth: options });
      const { missed, falses } = matchSpots({ analysis, spots: options.spots ?? [] });
      expect(missed).toEqual([]);
      expect(falses.length).toBeLessThanOrEqual(MAX_FALSE_CANDIDATES);
      // Sizes: the equivalent radius within 35 % (the penumbra's soft edge is shared with the noise).
      for (const spot of options.spots ?? []) {
        const candidate = analysis.candidates.find(
          (c) => Math.hypot(c.xPx - spot.xPx, c.yPx - spot.yPx) < spot.radiusPx + 3,
        )!;
        expect(Math.abs(candidate.radiusPx - spot.radiusPx) / spot.radiusPx).toBeLessThan(0.35);
        expect(candidate.hasUmbra).toBe(true);
      }
    });
  }

  it("reports progress through the stages, in order, ending at done", () => {
    const stages: string[] = [];
    analysePhoto({
      image: makeSyntheticDisk({ width: 300, height: 300, centreXPx: 150, centreYPx: 150, radiusPx: 120 }),
      onProgress: ({ stage, fraction }) => {
        expect(fraction).toBeGreaterThanOrEqual(0);
        expect(fraction).toBeLessThanOrEqual(1);
        if (stages.at(-1) !== stage) stages.push(stage);
      },
    });
    expect(stages).toEqual(["limb", "spots", "done"]);
  });

  it("finds no limb in a frame with no disk, and proposes nothing", () => {
    const blank = { data: new Uint8Array(200 * 150).fill(40), width: 200, height: 150 };
    const analysis = analysePhoto({ image: blank });
    expect(analysis.limb).toBeNull();
    expect(analysis.candidates).toEqual([]);
  });

  it("proposes no candidates on a spotless disk", () => {
    const options = { width: 800, height: 800, centreXPx: 400, centreYPx: 400, radiusPx: 330, seed: 9 };
    const analysis = analysePhoto({ image: makeSyntheticDisk(options) });
    expect(analysis.candidates.length).toBeLessThanOrEqual(MAX_FALSE_CANDIDATES);
  });

  it("gives a spot's area in millionths of the hemisphere, corrected for foreshortening", () => {
    // A spot of radius 20 px at the centre of a 400 px disk covers (20/400)² = 1/400 of the disk's area,
    // i.e. 1e6 / 400 / 2 = 1250 MSH of the hemisphere (projected area / 2πR², common practice).
    const image = makeSyntheticDisk({
      width: 1000,
      height: 1000,
      centreXPx: 500,
      centreYPx: 500,
      radiusPx: 400,
      noiseSigma: 1,
      spots: [{ xPx: 500, yPx: 500, radiusPx: 20 }],
    });
    const [candidate] = findSpotCandidates({
      image,
      limb: { centreXPx: 500, centreYPx: 500, radiusPx: 400 },
    });
    expect(candidate).toBeDefined();
    expect(candidate!.areaMsh).toBeGreaterThan(1250 * 0.85);
    expect(candidate!.areaMsh).toBeLessThan(1250 * 1.15);
    expect(candidate!.radialFraction).toBeLessThan(0.01);
  });
});

describe("trimmed circle fit", () => {
  it("ignores a third of the points far off the circle", () => {
    const xs: number[] = [];
    const ys: number[] = [];
    for (let k = 0; k < 300; k += 1) {
      const a = (2 * Math.PI * k) / 300;
      const r = k % 3 === 0 ? 70 + (k % 7) : 100; // every third point sits on a cloud edge inside
      xs.push(50 + r * Math.cos(a));
      ys.push(-20 + r * Math.sin(a));
    }
    const fit = fitCircleTrimmed({ xs, ys });
    expect(fit!.circle.cx).toBeCloseTo(50, 3);
    expect(fit!.circle.cy).toBeCloseTo(-20, 3);
    expect(fit!.circle.r).toBeCloseTo(100, 3);
  });
});
