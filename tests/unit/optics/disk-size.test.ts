import { describe, expect, it } from "vitest";

import { getProjectedDiskDiameterMm } from "@/lib/optics/disk-size";
import { planProjection, projectedDiskDiameterMm } from "@/lib/optics/planner";
import type { InstrumentOptics } from "@/lib/optics/types";
import { toMillimetres } from "@/lib/optics/units";
import { solarOrientation } from "@/lib/solar/ephemeris";

const at = new Date("2026-03-20T12:00:00Z");
const mirror: InstrumentOptics = {
  kind: "mirror",
  mirrorSizeMm: 50,
  maskDiameterMm: 6,
  throwDistanceMm: 10_500,
  incidenceAngleDeg: 20,
  surface: "first",
};
const pinhole: InstrumentOptics = { kind: "pinhole", holeDiameterMm: 1.4, boxLengthMm: 1800 };
const eyepiece: InstrumentOptics = {
  kind: "eyepiece-projection",
  apertureMm: 80,
  focalLengthMm: 900,
  eyepieceFocalLengthMm: 25,
  eyepieceToScreenMm: 300,
};

describe("getProjectedDiskDiameterMm", () => {
  it.each([mirror, pinhole, eyepiece])(
    "agrees with the planner for a $kind using the ephemeris's size",
    (optics) => {
      const semidiameterArcsec = solarOrientation(at).semidiameterArcsec;
      const plan = planProjection({ instrument: optics, options: { semidiameterArcsec } });
      expect("diskDiameterMm" in plan).toBe(true);
      expect(getProjectedDiskDiameterMm({ instrument: optics, at })).toBeCloseTo(
        (plan as { diskDiameterMm: number }).diskDiameterMm,
        10,
      );
    },
  );

  it("takes a stored instruments row ({ kind, params }) as well", () => {
    const { kind, ...params } = mirror;
    expect(getProjectedDiskDiameterMm({ instrument: { kind, params }, at })).toBeCloseTo(
      getProjectedDiskDiameterMm({ instrument: mirror, at })!,
      10,
    );
  });

  it("is the throw times the Sun's apparent diameter for a mirror", () => {
    const diameterArcsec = 2 * solarOrientation(at).semidiameterArcsec;
    expect(getProjectedDiskDiameterMm({ instrument: mirror, at })).toBeCloseTo(
      projectedDiskDiameterMm({ distanceMm: 10_500, sunDiameterArcsec: diameterArcsec }),
      10,
    );
  });

  it("gives about 10 cm (4 in) at 10–12 m (common practice, PRODUCT.md)", () => {
    for (const throwDistanceMm of [10_000, 12_000]) {
      const mm = getProjectedDiskDiameterMm({ instrument: { ...mirror, throwDistanceMm }, at })!;
      expect(mm).toBeGreaterThan(85);
      expect(mm).toBeLessThan(120);
    }
    expect(
      getProjectedDiskDiameterMm({ instrument: { ...mirror, throwDistanceMm: 11_000 }, at })! /
        toMillimetres({ value: 4, unit: "in" }),
    ).toBeCloseTo(1, 0);
  });

  it("follows the Sun's size through the year, from perihelion to aphelion", () => {
    const january = getProjectedDiskDiameterMm({ instrument: mirror, at: new Date("2026-01-03T12:00:00Z") })!;
    const july = getProjectedDiskDiameterMm({ instrument: mirror, at: new Date("2026-07-06T12:00:00Z") })!;
    const arcminAt = (mm: number) => (2 * Math.atan(mm / 2 / 10_500) * 180 * 60) / Math.PI;
    // 959.63″ at 1 au seen from the perihelion and aphelion distances, 0.98329 and 1.01671 au
    // (Earth's orbit, e = 0.0167; almanac values, from memory): 32.53′ and 31.46′.
    expect(arcminAt(january)).toBeCloseTo((2 * 959.63) / 0.98329 / 60, 1);
    expect(arcminAt(july)).toBeCloseTo((2 * 959.63) / 1.01671 / 60, 1);
    // PRODUCT.md's rounder "about 32.7′ in January, 31.6′ in July".
    expect(Math.abs(arcminAt(january) - 32.7)).toBeLessThan(0.25);
    expect(Math.abs(arcminAt(july) - 31.6)).toBeLessThan(0.25);
  });

  it("is null for kinds that do not project onto a card", () => {
    expect(
      getProjectedDiskDiameterMm({
        instrument: { kind: "camera", focalLengthMm: 600, pixelSizeUm: 3.76, filter: "film" },
        at,
      }),
    ).toBeNull();
    expect(
      getProjectedDiskDiameterMm({
        instrument: { kind: "filtered-telescope", apertureMm: 90, magnification: 50, filter: "film" },
        at,
      }),
    ).toBeNull();
  });

  it("is null for a stored profile whose sizes are missing or do not pass the schema", () => {
    expect(getProjectedDiskDiameterMm({ instrument: { kind: "pinhole", params: {} }, at })).toBeNull();
    expect(
      getProjectedDiskDiameterMm({
        instrument: { kind: "pinhole", params: { holeDiameterMm: 0, boxLengthMm: 900 } },
        at,
      }),
    ).toBeNull();
    expect(
      getProjectedDiskDiameterMm({ instrument: { kind: "periscope", params: { boxLengthMm: 900 } }, at }),
    ).toBeNull();
    expect(getProjectedDiskDiameterMm({ instrument: { kind: "pinhole", params: null }, at })).toBeNull();
  });

  it("is null, not an exception, for optics the planner cannot plan", () => {
    expect(getProjectedDiskDiameterMm({ instrument: { ...pinhole, boxLengthMm: -5 }, at })).toBeNull();
  });
});
