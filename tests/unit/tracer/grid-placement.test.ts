import { describe, expect, it } from "vitest";

import { computeHeliographicGrid } from "@/lib/solar/grid";
import { placeGridOnTracing } from "@/lib/tracer/grid-placement";
import { documentToSky, resolveSkyFrame } from "@/lib/tracer/orientation";

import { TEST_SUN } from "./support";

describe("placing the grid on a tracing", () => {
  it("puts every grid point where documentToSky reads it back, mirrored and turned", () => {
    const result = resolveSkyFrame({
      disk: { cx: 300, cy: 320, r: 250 },
      orientation: { mode: "drift", from: { x: 0, y: 0 }, to: { x: 40, y: -25 }, mirrored: true },
    });
    if (!result.ok) throw new Error(result.message);
    const grid = computeHeliographicGrid({ at: TEST_SUN });
    const placed = placeGridOnTracing({ grid, frame: result.frame });
    const [equator] = placed.equator;
    const [sky] = grid.equator.segments;
    expect(equator!.length).toBe(sky!.length * 2);
    for (let i = 0; i < sky!.length; i += 7) {
      const back = documentToSky({
        point: { x: equator![2 * i]!, y: equator![2 * i + 1]! },
        frame: result.frame,
      });
      expect(back.x).toBeCloseTo(sky![i]!.x, 9);
      expect(back.y).toBeCloseTo(sky![i]!.y, 9);
    }
    expect(placed.lines.length).toBe(
      grid.parallels.concat().reduce((n, l) => n + l.segments.length, 0) +
        grid.meridians.reduce((n, l) => n + l.segments.length, 0),
    );
    expect(placed.northPole === null).toBe(grid.northPole === null);
  });
});
