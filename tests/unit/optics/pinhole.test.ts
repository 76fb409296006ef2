import { describe, expect, it } from "vitest";

import { bestPinholeDiameterMm, planPinhole } from "@/lib/optics/pinhole";
import { planProjection } from "@/lib/optics/planner";

const codes = (warnings: { code: string }[]) => warnings.map((w) => w.code);

describe("bestPinholeDiameterMm (Rayleigh 1891; M. Young 1971, Applied Optics 10, 2763)", () => {
  it("gives about 1.41 mm for a 1 m box at 550 nm", () => {
    // By hand: f λ = 1000 mm × 0.000550 mm = 0.55 mm²; √0.55 = 0.7416 mm;
    // d = 1.9 × 0.7416 = 1.409 mm.
    expect(bestPinholeDiameterMm({ boxLengthMm: 1000 })).toBeCloseTo(1.409, 3);
  });

  it("grows as the square root of the box length", () => {
    // By hand: 4 m → 2 × 1.409 = 2.818 mm.
    expect(bestPinholeDiameterMm({ boxLengthMm: 4000 })).toBeCloseTo(2.818, 2);
  });

  it("uses the wavelength given", () => {
    // By hand: 1.9 × √(1000 × 0.000400) = 1.9 × 0.6325 = 1.202 mm.
    expect(bestPinholeDiameterMm({ boxLengthMm: 1000, wavelengthNm: 400 })).toBeCloseTo(1.202, 3);
  });
});

describe("planPinhole", () => {
  it("projects a 9.3 mm disk from a 1 m box (1919″ = 0.009305 rad × 1000 mm)", () => {
    const plan = planPinhole({ instrument: { kind: "pinhole", holeDiameterMm: 1.41, boxLengthMm: 1000 } });
    expect(plan.diskDiameterMm).toBeCloseTo(9.305, 2);
  });

  it("reports the hole's own size as geometric blur and 2.44 λ/d as diffraction", () => {
    const plan = planPinhole({ instrument: { kind: "pinhole", holeDiameterMm: 1.41, boxLengthMm: 1000 } });
    // By hand: 1.41 / 1000 rad × 206265 = 290.8″; 2.44 × 0.00055 / 1.41 rad = 196.3″.
    expect(plan.geometricBlur.arcsec).toBeCloseTo(290.8, 0);
    expect(plan.diffractionBlur?.arcsec).toBeCloseTo(196.3, 0);
    expect(plan.geometricBlur.fractionOfDisk).toBeCloseTo(290.8 / 1919.26, 3);
    expect(plan.combinedBlur.arcsec).toBeGreaterThan(plan.geometricBlur.arcsec);
  });

  it("reports how far the hole is from Rayleigh's best", () => {
    const plan = planPinhole({ instrument: { kind: "pinhole", holeDiameterMm: 2.818, boxLengthMm: 1000 } });
    expect(plan.bestHoleDiameterMm).toBeCloseTo(1.409, 3);
    expect(plan.holeToBestRatio).toBeCloseTo(2, 2);
    expect(codes(plan.warnings)).toContain("pinhole-larger-than-best");
  });

  it("flags a hole far below the best size", () => {
    const plan = planPinhole({ instrument: { kind: "pinhole", holeDiameterMm: 0.5, boxLengthMm: 1000 } });
    expect(codes(plan.warnings)).toContain("pinhole-smaller-than-best");
  });

  it("stays quiet about the hole at the best size", () => {
    const plan = planPinhole({ instrument: { kind: "pinhole", holeDiameterMm: 1.41, boxLengthMm: 1000 } });
    expect(codes(plan.warnings)).not.toContain("pinhole-larger-than-best");
    expect(codes(plan.warnings)).not.toContain("pinhole-smaller-than-best");
    expect(codes(plan.warnings)).not.toContain("pinhole-over-one-percent");
  });

  describe("common practice: a pinhole should be well under 1 % of the throw", () => {
    it("warns above 1 %", () => {
      const plan = planPinhole({ instrument: { kind: "pinhole", holeDiameterMm: 12, boxLengthMm: 1000 } });
      expect(plan.holeFractionOfBoxLength).toBeCloseTo(0.012, 6);
      expect(codes(plan.warnings)).toContain("pinhole-over-one-percent");
    });

    it("agrees with geometry: at 1 % the hole (34.4′) already blurs more than the whole Sun (32′)", () => {
      const plan = planPinhole({ instrument: { kind: "pinhole", holeDiameterMm: 10, boxLengthMm: 1000 } });
      expect(plan.geometricBlur.fractionOfDisk).toBeGreaterThan(1);
    });
  });

  it("warns that a 1 m pinhole box shows only the largest spots", () => {
    const plan = planPinhole({ instrument: { kind: "pinhole", holeDiameterMm: 1.41, boxLengthMm: 1000 } });
    expect(codes(plan.warnings)).toContain("blur-hides-most-spots");
    expect(plan.smallestSpot.limitedBy).toBe("blur");
    expect(plan.smallestSpot.km).toBeCloseTo(plan.smallestSpot.arcsec * 724.97, 0);
  });

  it("is what planProjection returns for a pinhole", () => {
    const instrument = { kind: "pinhole", holeDiameterMm: 1.41, boxLengthMm: 1000 } as const;
    expect(planProjection({ instrument })).toEqual(planPinhole({ instrument }));
  });

  it("refuses a zero-size hole", () => {
    expect(() =>
      planPinhole({ instrument: { kind: "pinhole", holeDiameterMm: 0, boxLengthMm: 1000 } }),
    ).toThrow(RangeError);
  });
});
