import { describe, expect, it } from "vitest";

import { solarOrientation } from "@/lib/solar/ephemeris";
import { heliographicToDisk } from "@/lib/solar/heliographic";
import { computeAreaMsh, computeDiskFraction, MAX_AREA_RHO_DEG, measureEllipseArea } from "@/lib/tracer/area";
import { resolveSkyFrame, skyToDocument } from "@/lib/tracer/orientation";

// A[MSH] = 1e6 · A_projected / (2π R² cos ρ): common practice (the Greenwich convention), see lib/tracer/area.ts.
describe("areas in millionths of the solar hemisphere", () => {
  it("a circle of 1% of the disk radius at disk centre covers 50 MSH", () => {
    // π(0.01R)² / (2πR²) = 0.5e-4 of the hemisphere = 50 millionths; worked by hand.
    const fraction = computeDiskFraction({
      ellipse: { cx: 0, cy: 0, rx: 4, ry: 4, rotationDeg: 0 },
      diskRadius: 400,
    });
    expect(computeAreaMsh({ diskFraction: fraction, mu: 1 })).toBeCloseTo(50, 10);
  });

  it("the whole disk seen face-on is half a hemisphere, 500 000 MSH, before correction", () => {
    expect(computeAreaMsh({ diskFraction: 1, mu: 1 })).toBe(500_000);
  });

  it("doubles a patch at ρ = 60°, where cos ρ = 1/2", () => {
    expect(computeAreaMsh({ diskFraction: 1e-4, mu: 0.5 })).toBeCloseTo(
      2 * computeAreaMsh({ diskFraction: 1e-4, mu: 1 }),
      10,
    );
  });

  it("corrects an ellipse drawn on a tracing by its own heliocentric angle", () => {
    const sun = solarOrientation(new Date("2024-05-10T12:00:00Z"));
    const disk = { cx: 500, cy: 500, r: 400 };
    const result = resolveSkyFrame({
      disk,
      orientation: { mode: "north", point: { x: 500, y: 0 }, mirrored: false },
    });
    if (!result.ok) throw new Error(result.message);
    const onSky = heliographicToDisk({ lat: 15, lon: 50 }, sun)!;
    const centre = skyToDocument({ point: onSky, frame: result.frame });
    const area = measureEllipseArea({
      ellipse: { cx: centre.x, cy: centre.y, rx: 8, ry: 4, rotationDeg: 30 },
      frame: result.frame,
      at: sun,
    });
    if (!area.ok) throw new Error(area.message);
    // Projected: 1e6 · (8·4/400²) / 2 = 100 MSH; corrected by the point's own cos ρ.
    expect(area.projectedMsh).toBeCloseTo(100, 9);
    expect(area.areaMsh).toBeCloseTo(100 / onSky.mu, 6);
    expect(area.rhoDeg).toBeCloseTo(onSky.rho, 6);
  });

  it("refuses to correct an area too near the limb", () => {
    const sun = solarOrientation(new Date("2024-05-10T12:00:00Z"));
    const result = resolveSkyFrame({
      disk: { cx: 0, cy: 0, r: 100 },
      orientation: { mode: "north", point: { x: 0, y: -200 }, mirrored: false },
    });
    if (!result.ok) throw new Error(result.message);
    const area = measureEllipseArea({
      ellipse: { cx: 99.8, cy: 0, rx: 1, ry: 1, rotationDeg: 0 },
      frame: result.frame,
      at: sun,
    });
    expect(area.ok).toBe(false);
    expect(MAX_AREA_RHO_DEG).toBeLessThan(90);
  });
});
