import { describe, expect, it } from "vitest";

import {
  bestMaskDiameterMm,
  describeSecondSurfaceGhost,
  frontSurfaceReflectance,
  maskDiameterForBlurMm,
  mirrorImageElongation,
  planMirror,
  throwDistanceForMaskMm,
} from "@/lib/optics/mirror";
import type { MirrorOptics } from "@/lib/optics/types";
import { fromMillimetres, toMillimetres } from "@/lib/optics/units";

const codes = (warnings: { code: string }[]) => warnings.map((w) => w.code);

function mirror(overrides: Partial<MirrorOptics> = {}): MirrorOptics {
  return {
    kind: "mirror",
    mirrorSizeMm: 50,
    maskDiameterMm: 6,
    throwDistanceMm: 10_500,
    incidenceAngleDeg: 10,
    surface: "first",
    ...overrides,
  };
}

const blurFraction = (maskDiameterMm: number, throwDistanceMm: number) =>
  planMirror({ instrument: mirror({ maskDiameterMm, throwDistanceMm }) }).combinedBlur.fractionOfDisk;

describe("facts of the trade (common practice, no published source; PRODUCT.md)", () => {
  it("a ¼-inch mask at 30–40 ft and a ½-inch mask at 60–70 ft give about the same blur", () => {
    const quarterInch = toMillimetres({ value: 0.25, unit: "in" });
    const halfInch = toMillimetres({ value: 0.5, unit: "in" });
    const ft = (value: number) => toMillimetres({ value, unit: "ft" });

    const smallMask = [blurFraction(quarterInch, ft(30)), blurFraction(quarterInch, ft(40))];
    const largeMask = [blurFraction(halfInch, ft(60)), blurFraction(halfInch, ft(70))];
    // The two ranges of blur overlap...
    expect(Math.max(...smallMask)).toBeGreaterThan(Math.min(...largeMask));
    // ...and at mid-range they agree within 15 %.
    const ratio = blurFraction(halfInch, ft(65)) / blurFraction(quarterInch, ft(35));
    expect(ratio).toBeGreaterThan(0.85);
    expect(ratio).toBeLessThan(1.15);
  });

  it("so the throw grows in proportion to the mask: 13 mm needs about 18–21 m for 6 mm's blur at 10.5 m", () => {
    const throwMm = throwDistanceForMaskMm({ maskDiameterMm: 13, blurFraction: blurFraction(6, 10_500) });
    // "About": the rule of thumb ignores diffraction, which favours the larger mask slightly.
    expect(throwMm).not.toBeNull();
    expect(throwMm!).toBeGreaterThan(17_000);
    expect(throwMm!).toBeLessThan(22_500);
  });

  it("the disk at 10–12 m is roughly 10 cm (4 in) across", () => {
    for (const throwDistanceMm of [10_000, 11_000, 12_000]) {
      const { diskDiameterMm } = planMirror({ instrument: mirror({ throwDistanceMm }) });
      expect(diskDiameterMm).toBeGreaterThan(85);
      expect(diskDiameterMm).toBeLessThan(115);
    }
    const at11m = planMirror({ instrument: mirror({ throwDistanceMm: 11_000 }) }).diskDiameterMm;
    expect(fromMillimetres({ valueMm: at11m, unit: "in" })).toBeCloseTo(4, 0);
  });

  describe("a glancing reflection blurs more than a near-perpendicular one", () => {
    const near = planMirror({ instrument: mirror({ incidenceAngleDeg: 10, surface: "second" }) });
    const glancing = planMirror({ instrument: mirror({ incidenceAngleDeg: 70, surface: "second" }) });

    it("stretches the disk and its blur on the card by 1 / cos i along the plane of incidence", () => {
      expect(glancing.elongation).toBeCloseTo(1 / Math.cos((70 * Math.PI) / 180), 6);
      expect(glancing.diskLengthAlongPlaneMm / glancing.diskDiameterMm).toBeCloseTo(glancing.elongation, 6);
      expect(glancing.alongPlane.blurOnCardMm).toBeGreaterThan(2 * near.alongPlane.blurOnCardMm);
    });

    it("narrows the opening along the plane, so its diffraction grows as 1 / cos i", () => {
      expect(
        glancing.alongPlane.diffractionBlur.arcsec / glancing.acrossPlane.diffractionBlur.arcsec,
      ).toBeCloseTo(glancing.elongation, 6);
      // For a ¼-inch mask this outweighs the narrower geometric blur.
      expect(glancing.combinedBlur.arcsec).toBeGreaterThan(near.combinedBlur.arcsec);
    });

    it("brightens the ghost of an ordinary glass mirror", () => {
      expect(glancing.ghost!.relativeBrightness).toBeGreaterThan(3 * near.ghost!.relativeBrightness);
    });

    it("raises a glancing-incidence warning only when glancing", () => {
      expect(codes(glancing.warnings)).toContain("glancing-incidence");
      expect(codes(near.warnings)).not.toContain("glancing-incidence");
    });
  });

  it("a first-surface mirror avoids a ghost reflection", () => {
    const plan = planMirror({ instrument: mirror({ surface: "first" }) });
    expect(plan.ghost).toBeNull();
    expect(codes(plan.warnings)).not.toContain("second-surface-ghost");
    expect(codes(planMirror({ instrument: mirror({ surface: "second" }) }).warnings)).toContain(
      "second-surface-ghost",
    );
  });
});

describe("frontSurfaceReflectance (Fresnel equations; e.g. E. Hecht, Optics)", () => {
  it("is about 4.3 % for glass of index 1.52 at normal incidence: ((n − 1)/(n + 1))²", () => {
    // By hand: (0.52 / 2.52)² = 0.04258.
    expect(frontSurfaceReflectance({ incidenceAngleDeg: 0 })).toBeCloseTo(0.04258, 4);
  });

  it("has no p-polarised reflection at Brewster's angle, atan(1.52) = 56.7°, so the average is half of R_s", () => {
    const brewsterDeg = (Math.atan(1.52) * 180) / Math.PI;
    const cosI = Math.cos((brewsterDeg * Math.PI) / 180);
    const cosT = Math.cos(Math.PI / 2 - (brewsterDeg * Math.PI) / 180);
    const rs = (cosI - 1.52 * cosT) / (cosI + 1.52 * cosT);
    expect(frontSurfaceReflectance({ incidenceAngleDeg: brewsterDeg })).toBeCloseTo((rs * rs) / 2, 6);
  });
});

describe("describeSecondSurfaceGhost", () => {
  it("sits on the main image at normal incidence and moves aside as the mirror turns", () => {
    expect(describeSecondSurfaceGhost({ incidenceAngleDeg: 0 }).offsetMm).toBe(0);
    expect(
      describeSecondSurfaceGhost({ incidenceAngleDeg: 45, glassThicknessMm: 4 }).offsetMm,
    ).toBeGreaterThan(2);
  });
});

describe("mask and throw sizing", () => {
  it("round-trips: the mask for a plan's blur at its throw is the plan's mask", () => {
    const plan = planMirror({ instrument: mirror({ incidenceAngleDeg: 0 }) });
    const maskMm = maskDiameterForBlurMm({
      throwDistanceMm: 10_500,
      blurFraction: plan.combinedBlur.fractionOfDisk,
    });
    // Seeing (2″) is in the plan's blur but not in the sizing formula, hence the tolerance.
    expect(maskMm).toBeCloseTo(6, 1);
  });

  it("gives no mask when even the sharpest opening can't reach the target at that throw", () => {
    // At 1 m the best any opening can do is √2 × √(2.44 λ / L) ≈ 26 % of the disk.
    expect(maskDiameterForBlurMm({ throwDistanceMm: 1000, blurFraction: 0.05 })).toBeNull();
    const best = bestMaskDiameterMm({ throwDistanceMm: 1000 });
    expect(best).toBeCloseTo(Math.sqrt(2.44 * 0.00055 * 1000), 6);
  });

  it("gives no throw when diffraction alone exceeds the target", () => {
    // A 0.1 mm opening diffracts 2.44 × 0.00055 / 0.1 rad = 2768″, more than the Sun.
    expect(throwDistanceForMaskMm({ maskDiameterMm: 0.1, blurFraction: 0.07 })).toBeNull();
  });

  it("asks for a longer throw at glancing incidence when the mask is near its diffraction limit", () => {
    // At 60° a 4.4 mm opening acts 2.2 mm wide along the plane, whose
    // diffraction (2.44 × 0.00055 / 2.2 rad = 126″) nearly fills a 7 % blur budget.
    const square = throwDistanceForMaskMm({ maskDiameterMm: 4.4, blurFraction: 0.07 });
    const glancing = throwDistanceForMaskMm({
      maskDiameterMm: 4.4,
      blurFraction: 0.07,
      incidenceAngleDeg: 60,
    });
    expect(square).not.toBeNull();
    expect(glancing).not.toBeNull();
    expect(glancing!).toBeGreaterThan(square!);
  });
});

describe("planMirror warnings", () => {
  it("suggests a mask or a longer throw when the blur is over the target", () => {
    const plan = planMirror({ instrument: mirror({ maskDiameterMm: undefined, throwDistanceMm: 5000 }) });
    expect(plan.apertureMm).toBe(50);
    const warning = plan.warnings.find((w) => w.code === "throw-too-short-for-aperture");
    expect(warning?.message).toMatch(/mask the mirror to about \d/);
  });

  it("treats a mask larger than the mirror as the mirror, and says so", () => {
    const plan = planMirror({ instrument: mirror({ mirrorSizeMm: 20, maskDiameterMm: 30 }) });
    expect(plan.apertureMm).toBe(20);
    expect(codes(plan.warnings)).toContain("mask-larger-than-mirror");
  });

  it("says a ¼-inch mask at 35 ft misses small groups, not most spots", () => {
    const plan = planMirror({ instrument: mirror({ throwDistanceMm: 10_668, maskDiameterMm: 6.35 }) });
    expect(codes(plan.warnings)).toContain("blur-hides-small-groups");
    expect(codes(plan.warnings)).not.toContain("blur-hides-most-spots");
  });

  it("refuses a 90° incidence", () => {
    expect(() => mirrorImageElongation({ incidenceAngleDeg: 90 })).toThrow(RangeError);
  });
});
