import { describe, expect, it } from "vitest";

import { planCamera } from "@/lib/optics/camera";
import { eyepieceProjectionMagnification, planEyepieceProjection } from "@/lib/optics/eyepiece-projection";
import {
  dawesLimitArcsec,
  planFilteredTelescope,
  rayleighLimitArcsec,
} from "@/lib/optics/filtered-telescope";
import { planProjection } from "@/lib/optics/planner";
import type { CameraOptics, EyepieceProjectionOptics, FilteredTelescopeOptics } from "@/lib/optics/types";

const codes = (warnings: { code: string }[]) => warnings.map((w) => w.code);

const refractor: EyepieceProjectionOptics = {
  kind: "eyepiece-projection",
  apertureMm: 80,
  focalLengthMm: 900,
  eyepieceFocalLengthMm: 25,
  eyepieceToScreenMm: 300,
};

describe("eyepiece projection (thin-lens approximation)", () => {
  it("enlarges the prime-focus image by (s − f_e) / f_e", () => {
    // By hand: (300 − 25) / 25 = 11.
    expect(eyepieceProjectionMagnification({ eyepieceFocalLengthMm: 25, eyepieceToScreenMm: 300 })).toBe(11);
  });

  it("projects a 92 mm disk from a 900 mm refractor, 25 mm eyepiece, card 300 mm behind", () => {
    const plan = planEyepieceProjection({ instrument: refractor });
    // By hand: effective focal length 900 × 11 = 9900 mm; × 0.009305 rad = 92.1 mm.
    expect(plan.effectiveFocalLengthMm).toBe(9900);
    expect(plan.diskDiameterMm).toBeCloseTo(92.1, 1);
    expect(plan.primeFocusDiskDiameterMm).toBeCloseTo(8.37, 2);
  });

  it("is diffraction- and seeing-limited, not blurred by the aperture", () => {
    const plan = planEyepieceProjection({ instrument: refractor });
    expect(plan.geometricBlur.arcsec).toBe(0);
    // By hand: 2.44 × 0.00055 mm / 80 mm rad × 206265 = 3.46″.
    expect(plan.diffractionBlur?.arcsec).toBeCloseTo(3.46, 2);
    expect(codes(plan.warnings)).not.toContain("blur-hides-small-groups");
  });

  it("refuses a card at or inside the eyepiece's focal length", () => {
    expect(() => planEyepieceProjection({ instrument: { ...refractor, eyepieceToScreenMm: 25 } })).toThrow(
      RangeError,
    );
  });

  it("warns about heat at the eyepiece for large apertures (common practice)", () => {
    const plan = planEyepieceProjection({
      instrument: { ...refractor, apertureMm: 200, focalLengthMm: 2000 },
    });
    expect(codes(plan.warnings)).toContain("aperture-heats-eyepiece");
    expect(codes(planEyepieceProjection({ instrument: refractor }).warnings)).not.toContain(
      "aperture-heats-eyepiece",
    );
  });
});

const camera: CameraOptics = {
  kind: "camera",
  focalLengthMm: 1000,
  pixelSizeUm: 3.76,
  filter: "white-light film, full aperture",
};

describe("camera", () => {
  it("puts the disk across about 2475 pixels at 1000 mm with 3.76 µm pixels", () => {
    const plan = planCamera({ instrument: camera });
    // By hand: 1000 mm × 0.009305 rad = 9.305 mm on the sensor; / 0.00376 mm = 2475 px.
    expect(plan.diskDiameterOnSensorMm).toBeCloseTo(9.305, 3);
    expect(plan.diskDiameterPx).toBeCloseTo(2475, -1);
    // By hand: 206265 × 0.00376 / 1000 = 0.776″ per pixel.
    expect(plan.pixelScaleArcsec).toBeCloseTo(0.776, 3);
  });

  it("has no diffraction figure without an aperture, and one with it", () => {
    expect(planCamera({ instrument: camera }).diffractionBlur).toBeNull();
    expect(planCamera({ instrument: { ...camera, apertureMm: 80 } }).diffractionBlur?.arcsec).toBeCloseTo(
      3.46,
      2,
    );
  });

  it("says when the pixels, not the optics, set the smallest spot", () => {
    const coarse = planCamera({ instrument: { ...camera, focalLengthMm: 200 } });
    expect(coarse.smallestSpot.limitedBy).toBe("pixels");
    expect(codes(coarse.warnings)).toContain("pixels-limit-detail");
  });

  it("warns when no filter is named, and about filters at the eyepiece", () => {
    expect(codes(planCamera({ instrument: { ...camera, filter: " " } }).warnings)).toContain(
      "filter-not-named",
    );
    expect(
      codes(planCamera({ instrument: { ...camera, filter: "eyepiece sun filter" } }).warnings),
    ).toContain("filter-at-eyepiece");
  });
});

const telescope: FilteredTelescopeOptics = {
  kind: "filtered-telescope",
  apertureMm: 80,
  magnification: 40,
  filter: "glass, full aperture",
};

describe("filtered telescope", () => {
  it("gives Dawes' limit 116/D (W. R. Dawes 1867): 1.45″ for 80 mm", () => {
    expect(dawesLimitArcsec({ apertureMm: 80 })).toBeCloseTo(1.45, 3);
  });

  it("gives Rayleigh's criterion 1.22 λ/D ≈ 138/D at 550 nm: 1.73″ for 80 mm", () => {
    expect(rayleighLimitArcsec({ apertureMm: 80 })).toBeCloseTo(138.4 / 80, 2);
  });

  it("shows the disk magnification times its true size", () => {
    // By hand: 40 × 1919.26″ / 3600 = 21.3°.
    expect(planFilteredTelescope({ instrument: telescope }).apparentDiskDiameterDeg).toBeCloseTo(21.33, 2);
  });

  it("lets the eye limit detail at low power", () => {
    const plan = planFilteredTelescope({ instrument: telescope });
    // By hand: the eye's 1′ at 40× is 60″ / 40 = 1.5″ on the Sun; the optics'
    // limit is a quarter of the 4.0″ blur (3.46″ diffraction with 2″ seeing), 1.0″.
    expect(plan.smallestSpot.limitedBy).toBe("eye");
    expect(plan.smallestSpot.arcsec).toBeCloseTo(1.5, 6);
  });

  it("warns about magnification beyond about 2× per mm (rule of thumb)", () => {
    const plan = planFilteredTelescope({ instrument: { ...telescope, magnification: 200 } });
    expect(codes(plan.warnings)).toContain("magnification-over-useful");
  });
});

describe("planProjection", () => {
  it("dispatches on kind and scales spot sizes with the date's distance", () => {
    const january = planProjection({
      instrument: telescope,
      options: { at: new Date("2024-01-03T00:00:00Z") },
    });
    const july = planProjection({ instrument: telescope, options: { at: new Date("2024-07-05T00:00:00Z") } });
    expect(january.kind).toBe("filtered-telescope");
    expect(january.sunDiameterArcsec).toBeGreaterThan(july.sunDiameterArcsec);
    // The same arcseconds span fewer km when the Sun is nearer.
    expect(january.kmPerArcsec).toBeLessThan(july.kmPerArcsec);
  });

  it("uses the ephemeris' semidiameter when given", () => {
    const plan = planProjection({ instrument: refractor, options: { semidiameterArcsec: 975 } });
    expect(plan.sunDiameterArcsec).toBe(1950);
  });
});
