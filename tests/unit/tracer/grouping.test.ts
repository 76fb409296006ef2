import { describe, expect, it } from "vitest";

import { computeCentroid, suggestGroups } from "@/lib/tracer/grouping";

describe("suggestGroups (single linkage on heliographic distance)", () => {
  it("keeps chains of close spots together and far spots apart", () => {
    const clusters = suggestGroups({
      spots: [
        { id: "a1", lat: 12, lon: -20 },
        { id: "a2", lat: 13, lon: -16 },
        { id: "a3", lat: 12.5, lon: -12 }, // 4° from a2: chained into one group 8° long
        { id: "b1", lat: -15, lon: 30 },
        { id: "c1", lat: 12, lon: 10 }, // same latitude as a, 22° away: its own group
      ],
    });
    expect(clusters).toEqual([["a1", "a2", "a3"], ["b1"], ["c1"]]);
  });

  it("uses the link distance it is given", () => {
    const spots = [
      { id: "x", lat: 0, lon: 0 },
      { id: "y", lat: 0, lon: 7 },
    ];
    expect(suggestGroups({ spots, linkDistanceDeg: 5 })).toHaveLength(2);
    expect(suggestGroups({ spots, linkDistanceDeg: 8 })).toEqual([["x", "y"]]);
  });

  it("returns nothing for no spots", () => {
    expect(suggestGroups({ spots: [] })).toEqual([]);
  });
});

describe("computeCentroid", () => {
  it("averages on the sphere", () => {
    const centre = computeCentroid({
      positions: [
        { lat: 10, lon: -5 },
        { lat: 10, lon: 5 },
      ],
    })!;
    expect(centre.lon).toBeCloseTo(0, 12);
    // Two points at 10° latitude 10° apart: the midpoint of the great circle lies slightly poleward.
    expect(centre.lat).toBeGreaterThan(10);
    expect(centre.lat).toBeLessThan(10.1);
  });

  it("handles a group straddling the equator", () => {
    const centre = computeCentroid({
      positions: [
        { lat: 2, lon: 30 },
        { lat: -4, lon: 30 },
      ],
    })!;
    expect(centre.lat).toBeCloseTo(-1, 2);
    expect(centre.lon).toBeCloseTo(30, 2);
  });

  it("is null for no positions", () => {
    expect(computeCentroid({ positions: [] })).toBeNull();
  });
});
