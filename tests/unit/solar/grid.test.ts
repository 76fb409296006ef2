import { describe, expect, it } from "vitest";

import { type SolarOrientation, solarOrientation } from "@/lib/solar/ephemeris";
import { computeHeliographicGrid, type HeliographicGrid } from "@/lib/solar/grid";
import { type DiskPoint, diskToHeliographic } from "@/lib/solar/heliographic";

const DEG = Math.PI / 180;

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

const CASES: Array<[string, SolarOrientation]> = [
  ["March, north pole hidden", solarOrientation(new Date("2021-03-06T00:00:00Z"))],
  ["June, B0 ≈ 0", solarOrientation(new Date("2021-06-06T12:00:00Z"))],
  ["September, north pole shown", solarOrientation(new Date("2021-09-08T00:00:00Z"))],
  ["October, P ≈ +26°", solarOrientation(new Date("2021-10-10T00:00:00Z"))],
  ["synthetic P −26°, B0 +7.25°", makeOrientation({ p: -26.3, b0: 7.25, l0: 3 })],
];

function allLines(grid: HeliographicGrid): DiskPoint[][] {
  return [
    ...grid.equator.segments,
    ...grid.centralMeridian.segments,
    ...grid.parallels.flatMap((line) => line.segments),
    ...grid.meridians.flatMap((line) => line.segments),
  ];
}

/** Points well inside the disk, where mapping back to the sphere is well conditioned. */
function interiorPoints(segment: DiskPoint[]): DiskPoint[] {
  return segment.filter((point) => Math.hypot(point.x, point.y) < 0.999);
}

describe.each(CASES)("computeHeliographicGrid: %s", (_label, orientation) => {
  const grid = computeHeliographicGrid({ at: orientation });

  it("keeps every point on the visible disk", () => {
    for (const segment of allLines(grid)) {
      expect(segment.length).toBeGreaterThanOrEqual(2);
      for (const point of segment) expect(Math.hypot(point.x, point.y)).toBeLessThanOrEqual(1 + 1e-12);
    }
  });

  it("ends clipped lines exactly on the limb (or at a visible pole)", () => {
    const poles = [grid.northPole, grid.southPole].filter((pole): pole is DiskPoint => pole !== null);
    const isPole = (point: DiskPoint) =>
      poles.some((pole) => Math.hypot(pole.x - point.x, pole.y - point.y) < 1e-9);
    const lines = [...grid.centralMeridian.segments, ...grid.meridians.flatMap((line) => line.segments)];
    for (const segment of lines) {
      for (const end of [segment[0], segment[segment.length - 1]]) {
        if (!end) throw new Error("empty segment");
        if (!isPole(end)) expect(Math.hypot(end.x, end.y)).toBeCloseTo(1, 12);
      }
    }
  });

  it("draws each parallel at its latitude", () => {
    expect(grid.parallels.map((line) => line.latDeg)).toEqual([
      -80, -70, -60, -50, -40, -30, -20, -10, 10, 20, 30, 40, 50, 60, 70, 80,
    ]);
    for (const line of [...grid.parallels, { latDeg: 0, segments: grid.equator.segments }]) {
      for (const point of line.segments.flatMap(interiorPoints)) {
        expect(diskToHeliographic(point, orientation)?.lat).toBeCloseTo(line.latDeg, 7);
      }
    }
  });

  it("draws each meridian at its central meridian distance, and every visible one", () => {
    const lons = grid.meridians.map((line) => line.lonDeg);
    for (let lon = -80; lon <= 80; lon += 10) if (lon !== 0) expect(lons).toContain(lon);
    // Beyond ±90° a meridian shows only where it runs into a visible pole.
    const poleVisible = grid.northPole !== null || grid.southPole !== null;
    for (const lon of lons) if (!poleVisible) expect(Math.abs(lon)).toBeLessThanOrEqual(90);
    if (poleVisible) expect(lons).toHaveLength(35);
    for (const line of grid.meridians) {
      const points = line.segments.flatMap(interiorPoints).filter((point) => {
        const lat = diskToHeliographic(point, orientation)?.lat ?? 90;
        return Math.abs(lat) < 89.9; // longitude is undefined at the poles
      });
      for (const point of points)
        expect(diskToHeliographic(point, orientation)?.lon).toBeCloseTo(line.lonDeg, 6);
    }
  });

  it("draws the central meridian along the projected rotation axis", () => {
    const { p } = orientation;
    expect(grid.centralMeridian.segments).toHaveLength(1);
    for (const point of grid.centralMeridian.segments.flat()) {
      const solarWest = point.x * Math.cos(p * DEG) + point.y * Math.sin(p * DEG);
      expect(Math.abs(solarWest)).toBeLessThan(1e-12);
    }
  });

  it("shows the pole tipped toward the Earth at position angle P", () => {
    const visible = orientation.b0 > 0 ? grid.northPole : grid.southPole;
    const hidden = orientation.b0 > 0 ? grid.southPole : grid.northPole;
    if (Math.abs(orientation.b0) > 0.3) {
      expect(visible).not.toBeNull();
      expect(hidden).toBeNull();
      // Position angle of the pole, measured from celestial north toward east (−x).
      const pa = Math.atan2(-(visible?.x ?? 0), visible?.y ?? 0) / DEG;
      expect(orientation.b0 > 0 ? pa : pa + (pa < 0 ? 180 : -180)).toBeCloseTo(orientation.p, 9);
      expect(Math.hypot(visible?.x ?? 0, visible?.y ?? 0)).toBeCloseTo(Math.cos(orientation.b0 * DEG), 2);
    } else {
      // Within S ≈ 0.27° of B0 = 0 both poles sit behind the limb.
      expect(grid.northPole === null || grid.southPole === null).toBe(true);
    }
  });

  it("returns a closed limb circle", () => {
    expect(grid.limb).toHaveLength(361);
    expect(grid.limb[0]).toEqual(grid.limb[360]);
    for (const point of grid.limb) expect(Math.hypot(point.x, point.y)).toBeCloseTo(1, 14);
  });
});

describe("computeHeliographicGrid options", () => {
  const orientation = solarOrientation(new Date("2021-09-08T00:00:00Z"));

  it("draws Carrington meridians at multiples of the spacing", () => {
    const grid = computeHeliographicGrid({ at: orientation, longitudeSystem: "carrington" });
    // The north pole is shown, so every one of the 36 meridians reaches the visible disk.
    expect(grid.meridians).toHaveLength(36);
    for (const line of grid.meridians) {
      const remainder = line.carringtonLonDeg % 10;
      expect(Math.min(remainder, 10 - remainder)).toBeLessThan(1e-9);
      const point = line.segments.flatMap(interiorPoints).find((candidate) => {
        const lat = diskToHeliographic(candidate, orientation)?.lat ?? 90;
        return Math.abs(lat) < 89.9;
      });
      expect(diskToHeliographic(point ?? { x: 9, y: 9 }, orientation)?.carringtonLon).toBeCloseTo(
        line.carringtonLonDeg,
        6,
      );
    }
    expect(grid.centralMeridian.segments).toHaveLength(1);
  });

  it("closes a parallel that is wholly visible", () => {
    // At B0 = +7.25° the 85° parallel never reaches the limb.
    const grid = computeHeliographicGrid({ at: orientation, spacingDeg: 5 });
    const line = grid.parallels.find((candidate) => candidate.latDeg === 85);
    expect(line?.segments).toHaveLength(1);
    const segment = line?.segments[0] ?? [];
    expect(segment[0]).toEqual(segment[segment.length - 1]);
    // …while its southern twin is hidden entirely.
    expect(grid.parallels.find((candidate) => candidate.latDeg === -85)).toBeUndefined();
  });

  it("finds a sliver of a parallel just inside the limb", () => {
    // B0 = +4.7°: the −85° parallel shows only for |CMD| < ~6.6°, a ~1° arc hugging the limb.
    const grid = computeHeliographicGrid({
      at: makeOrientation({ b0: 4.7 }),
      spacingDeg: 5,
      sampleStepDeg: 3,
    });
    const sliver = grid.parallels.find((candidate) => candidate.latDeg === -85);
    expect(sliver?.segments).toHaveLength(1);
    const segment = sliver?.segments[0] ?? [];
    for (const point of segment) expect(Math.hypot(point.x, point.y)).toBeGreaterThan(0.99);
    expect(
      diskToHeliographic(segment[Math.floor(segment.length / 2)] ?? { x: 9, y: 9 }, grid.orientation)?.lat,
    ).toBeCloseTo(-85, 6);
  });

  it("accepts a Date and matches the precomputed orientation", () => {
    const at = new Date("2021-09-08T00:00:00Z");
    expect(computeHeliographicGrid({ at }).parallels).toEqual(
      computeHeliographicGrid({ at: orientation }).parallels,
    );
  });

  it("rejects a spacing that does not divide 90 and a non-positive step", () => {
    expect(() => computeHeliographicGrid({ at: orientation, spacingDeg: 7 })).toThrow(RangeError);
    expect(() => computeHeliographicGrid({ at: orientation, spacingDeg: 0 })).toThrow(RangeError);
    expect(() => computeHeliographicGrid({ at: orientation, sampleStepDeg: 0 })).toThrow(RangeError);
  });
});
