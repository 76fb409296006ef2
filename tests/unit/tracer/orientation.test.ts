import { describe, expect, it } from "vitest";

import { solarOrientation } from "@/lib/solar/ephemeris";
import { diskToHeliographic, heliographicToDisk } from "@/lib/solar/heliographic";
import { documentToSky, resolveSkyFrame, skyToDocument, type SkyFrame } from "@/lib/tracer/orientation";

const disk = { cx: 500, cy: 500, r: 400 };

function frameOf(result: ReturnType<typeof resolveSkyFrame>): SkyFrame {
  if (!result.ok) throw new Error(result.message);
  return result.frame;
}

describe("north mark → sky axes", () => {
  it("on an image shown as on the sky (north up), right is celestial west", () => {
    const frame = frameOf(
      resolveSkyFrame({ disk, orientation: { mode: "north", point: { x: 500, y: 20 }, mirrored: false } }),
    );
    expect(documentToSky({ point: { x: 900, y: 500 }, frame })).toEqual({ x: 1, y: 0 });
    expect(documentToSky({ point: { x: 500, y: 100 }, frame })).toEqual({ x: 0, y: 1 });
  });

  it("on a mirror-reversed image (north up), right is celestial east", () => {
    const frame = frameOf(
      resolveSkyFrame({ disk, orientation: { mode: "north", point: { x: 500, y: 20 }, mirrored: true } }),
    );
    expect(documentToSky({ point: { x: 900, y: 500 }, frame })).toEqual({ x: -1, y: 0 });
    expect(documentToSky({ point: { x: 500, y: 100 }, frame })).toEqual({ x: 0, y: 1 });
  });

  it("follows a turned image: north marked to the right puts west at the bottom", () => {
    const frame = frameOf(
      resolveSkyFrame({ disk, orientation: { mode: "north", point: { x: 990, y: 500 }, mirrored: false } }),
    );
    const sky = documentToSky({ point: { x: 500, y: 900 }, frame });
    expect(sky.x).toBeCloseTo(1, 12);
    expect(sky.y).toBeCloseTo(0, 12);
  });
});

describe("drift line → sky axes (with the drive off the image drifts toward celestial west; common practice)", () => {
  it("a drift to the right on an unmirrored image puts north up", () => {
    const frame = frameOf(
      resolveSkyFrame({
        disk,
        orientation: { mode: "drift", from: { x: 100, y: 300 }, to: { x: 400, y: 300 }, mirrored: false },
      }),
    );
    expect(frame.north.x).toBeCloseTo(0, 12);
    expect(frame.north.y).toBeCloseTo(-1, 12);
  });

  it("a drift to the left on a mirrored image also puts north up", () => {
    const frame = frameOf(
      resolveSkyFrame({
        disk,
        orientation: { mode: "drift", from: { x: 400, y: 300 }, to: { x: 100, y: 300 }, mirrored: true },
      }),
    );
    expect(frame.north.x).toBeCloseTo(0, 12);
    expect(frame.north.y).toBeCloseTo(-1, 12);
  });

  it("agrees with the north mark for any turn, mirrored or not", () => {
    for (const mirrored of [false, true]) {
      for (const turnDeg of [0, 17, 90, 143, 222, 301]) {
        const t = (turnDeg * Math.PI) / 180;
        const north = { x: Math.sin(t), y: -Math.cos(t) }; // "up" turned clockwise on the screen
        const byMark = frameOf(
          resolveSkyFrame({
            disk,
            orientation: {
              mode: "north",
              point: { x: 500 + 300 * north.x, y: 500 + 300 * north.y },
              mirrored,
            },
          }),
        );
        const west = byMark.west;
        const byDrift = frameOf(
          resolveSkyFrame({
            disk,
            orientation: {
              mode: "drift",
              from: { x: 10, y: 10 },
              to: { x: 10 + 50 * west.x, y: 10 + 50 * west.y },
              mirrored,
            },
          }),
        );
        expect(byDrift.north.x).toBeCloseTo(byMark.north.x, 12);
        expect(byDrift.north.y).toBeCloseTo(byMark.north.y, 12);
      }
    }
  });
});

describe("round trips and refusals", () => {
  it("documentToSky and skyToDocument invert each other", () => {
    const frame = frameOf(
      resolveSkyFrame({ disk, orientation: { mode: "north", point: { x: 800, y: 111 }, mirrored: true } }),
    );
    for (const point of [
      { x: 500, y: 500 },
      { x: 123, y: 456 },
      { x: 870, y: 300 },
    ]) {
      const back = skyToDocument({ point: documentToSky({ point, frame }), frame });
      expect(back.x).toBeCloseTo(point.x, 9);
      expect(back.y).toBeCloseTo(point.y, 9);
    }
  });

  it("explains what is missing", () => {
    const noDisk = resolveSkyFrame({ disk: null, orientation: null });
    expect(noDisk.ok).toBe(false);
    if (!noDisk.ok) expect(noDisk.message).toMatch(/Fit the disk/);
    const noOrientation = resolveSkyFrame({ disk, orientation: null });
    if (noOrientation.ok) throw new Error("should fail");
    expect(noOrientation.message).toMatch(/Orient the disk/);
    const onCentre = resolveSkyFrame({
      disk,
      orientation: { mode: "north", point: { x: 500, y: 500 }, mirrored: false },
    });
    if (onCentre.ok) throw new Error("should fail");
    expect(onCentre.message).toMatch(/centre/);
    const noLength = resolveSkyFrame({
      disk,
      orientation: { mode: "drift", from: { x: 1, y: 1 }, to: { x: 1, y: 1 }, mirrored: false },
    });
    if (noLength.ok) throw new Error("should fail");
    expect(noLength.message).toMatch(/no length/);
  });
});

describe("with the Sun's orientation", () => {
  // Meeus, Astronomical Algorithms (2nd ed.), Example 29.a: 1992 Oct 13 0h TD, P = +26.27°, B0 = +5.99°.
  const at = new Date("1992-10-13T00:00:00Z");
  const sun = solarOrientation(at);

  it("puts the Sun's north pole east of celestial north when P is positive", () => {
    const pole = heliographicToDisk({ lat: 90, lon: 0 }, sun);
    expect(pole).not.toBeNull();
    const upright = frameOf(
      resolveSkyFrame({ disk, orientation: { mode: "north", point: { x: 500, y: 0 }, mirrored: false } }),
    );
    const mirrored = frameOf(
      resolveSkyFrame({ disk, orientation: { mode: "north", point: { x: 500, y: 0 }, mirrored: true } }),
    );
    // East is left on an upright sky view and right on a mirrored one.
    expect(skyToDocument({ point: pole!, frame: upright }).x).toBeLessThan(500);
    expect(skyToDocument({ point: pole!, frame: mirrored }).x).toBeGreaterThan(500);
  });

  it("measures back the heliographic position a spot was drawn at, for any orientation", () => {
    const frame = frameOf(
      resolveSkyFrame({
        disk,
        orientation: { mode: "drift", from: { x: 0, y: 0 }, to: { x: -30, y: 70 }, mirrored: true },
      }),
    );
    for (const target of [
      { lat: 20, lon: -30 },
      { lat: -12.5, lon: 41 },
      { lat: 0, lon: 0 },
    ]) {
      const onSky = heliographicToDisk(target, sun)!;
      const drawn = skyToDocument({ point: onSky, frame });
      const measured = diskToHeliographic(documentToSky({ point: drawn, frame }), sun)!;
      expect(measured.lat).toBeCloseTo(target.lat, 9);
      expect(measured.lon).toBeCloseTo(target.lon, 9);
    }
  });
});
