import { describe, expect, it } from "vitest";

import { computeAngularSeparationDeg } from "@/lib/solar/angles";
import { type SolarOrientation, solarOrientation } from "@/lib/solar/ephemeris";
import { diskToHeliographic, heliographicToDisk, projectHeliographicToDisk } from "@/lib/solar/heliographic";

import { sunpyFixture } from "./sunpy-fixture";

const DEG = Math.PI / 180;

/** A hand-made orientation for sign checks; semidiameter of the Sun at 1 au. */
function makeOrientation(overrides: Partial<SolarOrientation>): SolarOrientation {
  return {
    p: 0,
    b0: 0,
    l0: 100,
    carringtonRotation: 2000.7222,
    semidiameterArcsec: 959.63,
    distanceAu: 1,
    ...overrides,
  };
}

/**
 * Independent geometry for the heliocentric angle: cast a ray from an observer
 * at distance 1/sin S (solar radii) at angle rS off the centre, intersect it
 * with the unit sphere, and measure the angle at the Sun's centre.
 */
function rhoByRayCastingDeg(r: number, semidiameterArcsec: number): number {
  const s = (semidiameterArcsec / 3600) * DEG;
  const distance = 1 / Math.sin(s);
  const theta = r * s;
  // Observer at (0, 0, distance) looking toward −z; ray direction (sin θ, 0, −cos θ).
  const dx = Math.sin(theta);
  const dz = -Math.cos(theta);
  // |o + t d|² = 1 → t² + 2 t (o·d) + |o|² − 1 = 0, nearest root.
  const od = distance * dz;
  const t = -od - Math.sqrt(Math.max(0, od * od - (distance * distance - 1)));
  const px = t * dx;
  const pz = distance + t * dz;
  return Math.atan2(px, pz) / DEG;
}

describe(`diskToHeliographic against sunpy ${sunpyFixture.sunpyVersion} (Helioprojective → Stonyhurst/Carrington)`, () => {
  const results = sunpyFixture.points.map((row) => {
    const ours = diskToHeliographic({ x: row.x, y: row.y }, new Date(row.at));
    if (!ours) throw new Error(`fixture point ${row.at} fell off the disk`);
    return {
      row,
      ours,
      stonyhurstErrorDeg: computeAngularSeparationDeg(ours, row),
      carringtonErrorDeg: computeAngularSeparationDeg(
        { lat: ours.lat, lon: ours.carringtonLon },
        { lat: row.lat, lon: row.carringtonLon },
      ),
    };
  });

  it("includes points out to 0.95 of the radius and the centre", () => {
    const radii = sunpyFixture.points.map((row) => Math.hypot(row.x, row.y));
    expect(results.length).toBeGreaterThanOrEqual(40);
    expect(Math.max(...radii)).toBeGreaterThan(0.949);
    expect(Math.min(...radii)).toBe(0);
  });

  it("places every point within 0.03° (measured max 0.001° Stonyhurst, 0.004° Carrington)", () => {
    for (const { row, stonyhurstErrorDeg, carringtonErrorDeg } of results) {
      expect(stonyhurstErrorDeg, row.at).toBeLessThan(0.03);
      expect(carringtonErrorDeg, row.at).toBeLessThan(0.03);
    }
    // Regression guard well inside the limit; the Carrington residual before
    // 1960 comes from astropy's TT = UTC + 32.184 s there (see ephemeris test).
    expect(Math.max(...results.map((result) => result.stonyhurstErrorDeg))).toBeLessThan(0.003);
    expect(Math.max(...results.map((result) => result.carringtonErrorDeg))).toBeLessThan(0.008);
  });
});

describe("diskToHeliographic geometry", () => {
  const orientation = solarOrientation(new Date("2024-05-10T12:00:00Z"));

  it("maps the disk centre to (B0, CMD 0, L0)", () => {
    const centre = diskToHeliographic({ x: 0, y: 0 }, orientation);
    expect(centre?.lat).toBeCloseTo(orientation.b0, 12);
    expect(centre?.lon).toBeCloseTo(0, 12);
    expect(centre?.carringtonLon).toBeCloseTo(orientation.l0, 12);
    expect(centre?.rho).toBe(0);
    expect(centre?.mu).toBe(1);
  });

  it("uses the finite-distance heliocentric angle (Thompson 2006), matching an independent ray cast", () => {
    for (let r = 0; r <= 1; r += 0.01) {
      const position = diskToHeliographic({ x: r, y: 0 }, orientation);
      expect(position?.rho).toBeCloseTo(rhoByRayCastingDeg(r, orientation.semidiameterArcsec), 7);
      expect(position?.mu).toBeCloseTo(Math.cos(((position?.rho ?? 0) * Math.PI) / 180), 12);
    }
  });

  it("puts the limb at ρ = 90° − S, about a quarter degree short of asin(1)", () => {
    const limb = diskToHeliographic({ x: 0, y: -1 }, orientation);
    const semidiameterDeg = orientation.semidiameterArcsec / 3600;
    expect(limb?.rho).toBeCloseTo(90 - semidiameterDeg, 9);
    expect(90 - (limb?.rho ?? 0)).toBeGreaterThan(0.25);
    // Half-way out the difference from asin(r) is still ~S/2 ≈ 0.13°.
    const half = diskToHeliographic({ x: 0.5, y: 0 }, orientation);
    expect(30 - (half?.rho ?? 0)).toBeCloseTo(semidiameterDeg / 2, 3);
  });

  it("returns null off the disk and for non-numbers", () => {
    expect(diskToHeliographic({ x: 1.000001, y: 0 }, orientation)).toBeNull();
    expect(diskToHeliographic({ x: 0.8, y: 0.6000001 }, orientation)).toBeNull();
    expect(diskToHeliographic({ x: 2, y: -3 }, orientation)).toBeNull();
    expect(diskToHeliographic({ x: Number.NaN, y: 0 }, orientation)).toBeNull();
    expect(diskToHeliographic({ x: 0.8, y: 0.6 }, orientation)).not.toBeNull();
  });

  it("gives the same answer for a Date and for its precomputed orientation", () => {
    const at = new Date("2024-05-10T12:00:00Z");
    expect(diskToHeliographic({ x: 0.3, y: -0.4 }, at)).toEqual(
      diskToHeliographic({ x: 0.3, y: -0.4 }, orientation),
    );
  });

  it("notices an orientation object edited in place", () => {
    const edited = makeOrientation({ p: 0 });
    const before = diskToHeliographic({ x: 0, y: 0.5 }, edited);
    edited.p = 90; // solar north now points to celestial east (−x)
    const after = diskToHeliographic({ x: 0, y: 0.5 }, edited);
    expect(before?.lon).toBeCloseTo(0, 12);
    expect(after?.lon).toBeGreaterThan(25); // north on the sky is now solar west
    expect(after?.lat).toBeCloseTo(0, 12);
  });
});

describe("orientation sign conventions", () => {
  it("P > 0 turns solar north east of celestial north (toward −x)", () => {
    const p = 20;
    const o = makeOrientation({ p });
    const solarNorthOnSky = { x: -0.6 * Math.sin(p * DEG), y: 0.6 * Math.cos(p * DEG) };
    const north = diskToHeliographic(solarNorthOnSky, o);
    expect(north?.lon).toBeCloseTo(0, 12);
    expect(north?.lat).toBeGreaterThan(30);
    const solarWestOnSky = { x: 0.6 * Math.cos(p * DEG), y: 0.6 * Math.sin(p * DEG) };
    const west = diskToHeliographic(solarWestOnSky, o);
    expect(west?.lat).toBeCloseTo(0, 12);
    expect(west?.lon).toBeGreaterThan(30);
    expect(west?.hemisphere).toBe("N");
  });

  it("B0 > 0 tips the north pole toward the observer", () => {
    const tipped = makeOrientation({ b0: 7 });
    expect(heliographicToDisk({ lat: 90, lon: 0 }, tipped)?.y).toBeCloseTo(Math.cos(7 * DEG), 2);
    expect(heliographicToDisk({ lat: -90, lon: 0 }, tipped)).toBeNull();
    expect(heliographicToDisk({ lat: 90, lon: 0 }, makeOrientation({ b0: -7 }))).toBeNull();
    // The equator crosses the central meridian south of the disk centre.
    expect(heliographicToDisk({ lat: 0, lon: 0 }, tipped)?.y).toBeLessThan(0);
  });

  it("labels hemispheres by latitude", () => {
    const o = makeOrientation({});
    expect(diskToHeliographic({ x: 0.1, y: 0.3 }, o)?.hemisphere).toBe("N");
    expect(diskToHeliographic({ x: 0.1, y: -0.3 }, o)?.hemisphere).toBe("S");
  });

  it("wraps Carrington longitude into [0, 360) and CMD into (−180, 180]", () => {
    const o = makeOrientation({ l0: 359.5 });
    const west = diskToHeliographic({ x: 0.5, y: 0 }, o);
    expect(west?.carringtonLon).toBeGreaterThanOrEqual(0);
    expect(west?.carringtonLon).toBeLessThan(360);
    expect(west?.carringtonLon).toBeCloseTo(359.5 + (west?.lon ?? 0) - 360, 9);
  });
});

describe("heliographicToDisk", () => {
  const instants = sunpyFixture.orientations.slice(0, 12).map((row) => solarOrientation(new Date(row.at)));

  it("round-trips disk → heliographic → disk to 1e-9 radius over the whole disk", () => {
    for (const o of instants) {
      for (let ix = -20; ix <= 20; ix += 1) {
        for (let iy = -20; iy <= 20; iy += 1) {
          const point = { x: ix / 20, y: iy / 20 };
          if (Math.hypot(point.x, point.y) > 0.999) continue;
          const position = diskToHeliographic(point, o);
          expect(position).not.toBeNull();
          const back = heliographicToDisk({ lat: position?.lat ?? 0, lon: position?.lon ?? 0 }, o);
          expect(back).not.toBeNull();
          expect(Math.hypot((back?.x ?? 0) - point.x, (back?.y ?? 0) - point.y)).toBeLessThan(1e-9);
          expect(back?.rho).toBeCloseTo(position?.rho ?? 0, 9);
        }
      }
    }
  });

  it("round-trips heliographic → disk → heliographic for visible points", () => {
    for (const o of instants) {
      for (let lat = -85; lat <= 85; lat += 5) {
        for (let lon = -85; lon <= 85; lon += 5) {
          const disk = heliographicToDisk({ lat, lon }, o);
          if (!disk) continue;
          const back = diskToHeliographic(disk, o);
          expect(computeAngularSeparationDeg({ lat, lon }, back ?? { lat: 999, lon: 0 })).toBeLessThan(1e-8);
        }
      }
    }
  });

  it("accepts a Carrington longitude instead of a CMD", () => {
    const o = instants[3] ?? makeOrientation({});
    const byCmd = heliographicToDisk({ lat: 12, lon: -33 }, o);
    const byCarrington = heliographicToDisk({ lat: 12, carringtonLon: o.l0 - 33 + 360 }, o);
    expect(byCarrington?.x).toBeCloseTo(byCmd?.x ?? Number.NaN, 12);
    expect(byCarrington?.y).toBeCloseTo(byCmd?.y ?? Number.NaN, 12);
  });

  it("returns null on the far side and keeps points just inside the limb", () => {
    const o = makeOrientation({ b0: 0 });
    expect(heliographicToDisk({ lat: 0, lon: 120 }, o)).toBeNull();
    expect(heliographicToDisk({ lat: 0, lon: 180 }, o)).toBeNull();
    expect(heliographicToDisk({ lat: Number.NaN, lon: 0 }, o)).toBeNull();
    // With the Earth at a finite distance the visible cap ends at ρ = 90° − S, not 90°.
    expect(heliographicToDisk({ lat: 0, lon: 89.9 }, o)).toBeNull();
    const justInside = heliographicToDisk({ lat: 0, lon: 89.7 }, o);
    expect(justInside).not.toBeNull();
    expect(Math.hypot(justInside?.x ?? 0, justInside?.y ?? 0)).toBeLessThanOrEqual(1);
  });

  it("reports a continuous limb margin for hidden points", () => {
    const o = makeOrientation({ b0: 0 });
    const onLimb = projectHeliographicToDisk({ lat: 0, lon: 90 - 959.63 / 3600 }, o);
    expect(onLimb.limbMargin).toBeCloseTo(0, 12);
    expect(Math.hypot(onLimb.x, onLimb.y)).toBeCloseTo(1, 9);
    expect(projectHeliographicToDisk({ lat: 0, lon: 150 }, o).limbMargin).toBeLessThan(0);
  });
});

describe("computeAngularSeparationDeg", () => {
  it("measures great-circle distances", () => {
    expect(computeAngularSeparationDeg({ lat: 0, lon: 0 }, { lat: 0, lon: 90 })).toBeCloseTo(90, 12);
    expect(computeAngularSeparationDeg({ lat: 89, lon: 0 }, { lat: 89, lon: 180 })).toBeCloseTo(2, 12);
    expect(computeAngularSeparationDeg({ lat: 10, lon: 359.9995 }, { lat: 10, lon: -0.0005 })).toBeCloseTo(
      0,
      9,
    );
  });
});
