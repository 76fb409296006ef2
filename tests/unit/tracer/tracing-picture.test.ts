import { describe, expect, it } from "vitest";

import { pictureOfTracing } from "@/lib/tracer/tracing-picture";
import { createEmptyTracing, type TracingDocument } from "@/lib/validation/tracing";

import { makeOrientedTracing } from "./support";

const label = (picture: ReturnType<typeof pictureOfTracing>, which: "N" | "E" | "S" | "W") => {
  const mark = picture.compass.find((m) => m.label === which);
  if (!mark) throw new Error(`no ${which} mark`);
  return mark;
};

describe("pictureOfTracing", () => {
  it("frames the disk with room for its sky directions", () => {
    const picture = pictureOfTracing(makeOrientedTracing());
    expect(picture.disk).toEqual({ cx: 500, cy: 500, r: 400 });
    expect(picture.viewBox.width).toBe(picture.viewBox.height);
    expect(picture.viewBox.x + picture.viewBox.width / 2).toBeCloseTo(500);
    // Every compass letter (1.1 radii out) lies inside the frame.
    for (const mark of picture.compass) {
      expect(mark.x).toBeGreaterThan(picture.viewBox.x);
      expect(mark.x).toBeLessThan(picture.viewBox.x + picture.viewBox.width);
      expect(mark.y).toBeGreaterThan(picture.viewBox.y);
      expect(mark.y).toBeLessThan(picture.viewBox.y + picture.viewBox.height);
    }
  });

  // Common practice: with celestial north up, the sky seen directly has east
  // on the left and west on the right; a mirror image swaps east and west.
  it("puts north at the north mark, east and west as the sky shows them, swapped when mirrored", () => {
    const picture = pictureOfTracing(makeOrientedTracing());
    expect(label(picture, "N").x).toBeCloseTo(500);
    expect(label(picture, "N").y).toBeCloseTo(500 - 440);
    expect(label(picture, "S").y).toBeCloseTo(940);
    expect(label(picture, "E").x).toBeCloseTo(60);
    expect(label(picture, "W").x).toBeCloseTo(940);

    const base = makeOrientedTracing();
    const mirrored = pictureOfTracing({
      ...base,
      orientation: { mode: "north", point: { x: 500, y: 40 }, mirrored: true },
    });
    expect(label(mirrored, "E").x).toBeCloseTo(940);
    expect(label(mirrored, "W").x).toBeCloseTo(60);
    expect(mirrored.mirrored).toBe(true);
  });

  it("takes the directions from a drift line: the image drifts west", () => {
    const picture = pictureOfTracing({
      ...makeOrientedTracing(),
      orientation: { mode: "drift", from: { x: 600, y: 100 }, to: { x: 600, y: 900 }, mirrored: false },
    });
    // Drifting down the drawing: west is down, and north a quarter turn from it, to the right.
    expect(label(picture, "W").y).toBeCloseTo(940);
    expect(label(picture, "N").x).toBeCloseTo(940);
  });

  it("labels each group just above its spots, and marks spots without a group", () => {
    const document: TracingDocument = {
      ...makeOrientedTracing(),
      spots: [
        { id: "a", x: 300, y: 320, umbraRadius: 4, penumbraRadius: 10, groupId: "g1", area: null },
        { id: "b", x: 340, y: 300, umbraRadius: 3, penumbraRadius: null, groupId: "g1", area: null },
        {
          id: "c",
          x: 600,
          y: 600,
          umbraRadius: 5,
          penumbraRadius: null,
          groupId: null,
          area: { cx: 600, cy: 600, rx: 8, ry: 6, rotationDeg: 30 },
        },
      ],
      groups: [
        { id: "g1", number: 7, zurichClass: "C", mcintoshClass: "Cao", area: null },
        {
          id: "g2",
          number: 8,
          zurichClass: null,
          mcintoshClass: null,
          area: { cx: 700, cy: 400, rx: 20, ry: 10, rotationDeg: 0 },
        },
        { id: "g3", number: 9, zurichClass: null, mcintoshClass: null, area: null },
      ],
    };
    const picture = pictureOfTracing(document);
    expect(picture.spots.map((s) => s.grouped)).toEqual([true, true, false]);
    expect(picture.spots[0]).toMatchObject({ umbra: 4, penumbra: 10 });
    const [seven, eight, ...rest] = picture.groupLabels;
    expect(rest).toEqual([]); // group 9 has neither spots nor an area: nothing to label
    expect(seven!.number).toBe(7);
    expect(seven!.x).toBeCloseTo(320);
    // Above the top of the highest spot (spot a's penumbra reaches y = 310; b's umbra 297).
    expect(seven!.y).toBeLessThan(297);
    expect(eight).toMatchObject({ number: 8, x: 700 });
    expect(eight!.y).toBeLessThan(380);
    // Spot c's and group 8's measured areas, drawn where the tracer put them.
    expect(picture.areas).toEqual([
      { cx: 600, cy: 600, rx: 8, ry: 6, rotationDeg: 30, of: "spot" },
      { cx: 700, cy: 400, rx: 20, ry: 10, rotationDeg: 0, of: "group" },
    ]);
  });

  it("shows the whole drawing, without directions, before the disk is fitted", () => {
    const picture = pictureOfTracing(createEmptyTracing({ width: 1200, height: 800 }));
    expect(picture.disk).toBeNull();
    expect(picture.compass).toEqual([]);
    expect(picture.viewBox).toEqual({ x: 0, y: 0, width: 1200, height: 800 });
  });
});
