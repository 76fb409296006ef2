import { describe, expect, it } from "vitest";

import { findSpotAt, isInsidePolygon, selectInsideLasso } from "@/lib/tracer/selection";

const spots = [
  { id: "small", x: 100, y: 100, umbraRadius: 2, penumbraRadius: null },
  { id: "big", x: 130, y: 100, umbraRadius: 4, penumbraRadius: 20 },
];

describe("picking spots", () => {
  it("finds the nearest spot whose size or the tolerance covers the point", () => {
    expect(findSpotAt({ spots, point: { x: 104, y: 100 }, toleranceUnits: 5 })).toBe("small");
    expect(findSpotAt({ spots, point: { x: 115, y: 100 }, toleranceUnits: 5 })).toBe("big"); // inside the penumbra
    expect(findSpotAt({ spots, point: { x: 100, y: 140 }, toleranceUnits: 5 })).toBeNull();
  });

  it("selects spots inside a lasso, concave outlines included", () => {
    // An L-shaped outline that holds "small" but not "big".
    const lasso = [
      { x: 90, y: 90 },
      { x: 110, y: 90 },
      { x: 110, y: 105 },
      { x: 160, y: 105 },
      { x: 160, y: 120 },
      { x: 90, y: 120 },
    ];
    expect(selectInsideLasso({ spots, lasso })).toEqual(["small"]);
    expect(isInsidePolygon({ point: { x: 130, y: 112 }, polygon: lasso })).toBe(true);
    expect(selectInsideLasso({ spots, lasso: lasso.slice(0, 2) })).toEqual([]);
  });
});
