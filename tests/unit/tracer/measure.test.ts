import { describe, expect, it } from "vitest";

import { measureTracing } from "@/lib/tracer/measure";
import { createEmptyTracing } from "@/lib/validation/tracing";

import { makeOrientedTracing, spotAt, TEST_SUN } from "./support";

function tracingWithTwoGroups() {
  const document = makeOrientedTracing();
  document.groups = [
    { id: "gN", number: 1, zurichClass: "C", mcintoshClass: "Cso", area: null },
    { id: "gS", number: 2, zurichClass: "A", mcintoshClass: "Axx", area: null },
  ];
  document.spots = [
    spotAt({ document, id: "n1", lat: 18, lon: -22, groupId: "gN" }),
    spotAt({ document, id: "n2", lat: 17, lon: -17, groupId: "gN" }),
    spotAt({ document, id: "n3", lat: 19, lon: -14, groupId: "gN" }),
    spotAt({ document, id: "s1", lat: -9, lon: 35, groupId: "gS" }),
  ];
  return document;
}

describe("measureTracing", () => {
  it("counts groups and spots, split by the hemisphere of each group's centre", () => {
    const result = measureTracing({ document: tracingWithTwoGroups(), orientation: TEST_SUN });
    expect(result.problems).toEqual([]);
    expect(result.counts).toEqual({
      groups: 2,
      spots: 4,
      northGroups: 1,
      northSpots: 3,
      southGroups: 1,
      southSpots: 1,
    });
  });

  it("gives each group its centre, CMD, Carrington longitude and extent", () => {
    const [north, south] = measureTracing({ document: tracingWithTwoGroups(), orientation: TEST_SUN }).groups;
    expect(north!.latitudeDeg).toBeCloseTo(18, 0);
    expect(north!.cmdDeg).toBeCloseTo(-17.7, 0);
    expect(north!.longitudinalExtentDeg).toBeCloseTo(8, 6);
    expect(north!.hemisphere).toBe("N");
    expect(south!.latitudeDeg).toBeCloseTo(-9, 9);
    expect(south!.cmdDeg).toBeCloseTo(35, 9);
    expect(south!.carringtonLonDeg).toBeCloseTo((35 + TEST_SUN.l0) % 360, 9);
    expect(south!.hemisphere).toBe("S");
  });

  it("refuses a disk with no orientation", () => {
    const document = { ...tracingWithTwoGroups(), orientation: null };
    const result = measureTracing({ document, orientation: TEST_SUN });
    expect(result.problems[0]).toMatchObject({ path: "orientation" });
    expect(result.problems[0]!.message).toMatch(/Orient the disk/);
  });

  it("refuses a tracing without a disk", () => {
    const result = measureTracing({ document: createEmptyTracing(), orientation: TEST_SUN });
    expect(result.problems[0]!.message).toMatch(/Fit the disk/);
  });

  it("names a spot outside the disk", () => {
    const document = tracingWithTwoGroups();
    document.spots.push({
      id: "out",
      x: 950,
      y: 500,
      umbraRadius: 4,
      penumbraRadius: null,
      groupId: "gS",
      area: null,
    });
    const result = measureTracing({ document, orientation: TEST_SUN });
    expect(result.problems).toContainEqual({
      path: "spots.4",
      message: "Spot 5 lies outside the disk. Move it onto the disk or delete it.",
    });
  });

  it("refuses ungrouped spots", () => {
    const document = tracingWithTwoGroups();
    document.spots[0] = { ...document.spots[0]!, groupId: null };
    const result = measureTracing({ document, orientation: TEST_SUN });
    expect(result.problems.map((p) => p.message).join(" ")).toMatch(/1 spot is not in a group/);
  });

  it("refuses a class that does not fit the group", () => {
    const document = tracingWithTwoGroups();
    document.groups[1] = { ...document.groups[1]!, zurichClass: "D", mcintoshClass: "Dso" };
    const messages = measureTracing({ document, orientation: TEST_SUN }).problems.map((p) => p.message);
    expect(messages).toContain(
      "Group 2: Zurich class D is bipolar and needs at least two spots; this group has 1.",
    );
  });

  it("refuses two groups with one number", () => {
    const document = tracingWithTwoGroups();
    document.groups[1] = { ...document.groups[1]!, number: 1 };
    expect(measureTracing({ document, orientation: TEST_SUN }).problems.map((p) => p.path)).toContain(
      "groups.1.number",
    );
  });

  it("adds up spot areas for a group without its own ellipse", () => {
    const document = tracingWithTwoGroups();
    const first = document.spots[0]!;
    const second = document.spots[1]!;
    document.spots[0] = { ...first, area: { cx: first.x, cy: first.y, rx: 4, ry: 4, rotationDeg: 0 } };
    document.spots[1] = { ...second, area: { cx: second.x, cy: second.y, rx: 4, ry: 4, rotationDeg: 0 } };
    const result = measureTracing({ document, orientation: TEST_SUN });
    const north = result.groups.find((g) => g.id === "gN")!;
    const spotAreas = result.spots.filter((s) => s.areaMsh !== null).map((s) => s.areaMsh!);
    expect(spotAreas).toHaveLength(2);
    expect(north.areaMsh).toBeCloseTo(spotAreas[0]! + spotAreas[1]!, 9);
    // 50 MSH projected each (r = 1% of the disk radius), a little more after correction.
    expect(spotAreas[0]!).toBeGreaterThan(50);
  });
});

describe("measureTracing and limb points", () => {
  const limb = (anglesDeg: number[]) =>
    anglesDeg.map((a) => ({
      x: 500 + 400 * Math.cos((a * Math.PI) / 180),
      y: 500 + 400 * Math.sin((a * Math.PI) / 180),
    }));

  it("accepts a disk that is the circle through its limb points", () => {
    const document = {
      ...makeOrientedTracing(),
      disk: { cx: 500, cy: 500, r: 400, method: "limb-points" as const, limbPoints: limb([0, 100, 220]) },
    };
    expect(measureTracing({ document, orientation: TEST_SUN }).problems).toEqual([]);
  });

  it("refuses fewer than three limb points", () => {
    const document = {
      ...makeOrientedTracing(),
      disk: { cx: 500, cy: 500, r: 400, method: "limb-points" as const, limbPoints: limb([0, 100]) },
    };
    expect(measureTracing({ document, orientation: TEST_SUN }).problems[0]!.message).toMatch(
      /at least three different points/,
    );
  });

  it("refuses collinear limb points", () => {
    const points = [
      { x: 100, y: 100 },
      { x: 200, y: 200 },
      { x: 300, y: 300 },
    ];
    const document = {
      ...makeOrientedTracing(),
      disk: { cx: 500, cy: 500, r: 400, method: "limb-points" as const, limbPoints: points },
    };
    expect(measureTracing({ document, orientation: TEST_SUN }).problems[0]!.message).toMatch(/straight line/);
  });

  it("refuses a disk that is not the circle through its points", () => {
    const document = {
      ...makeOrientedTracing(),
      disk: { cx: 520, cy: 500, r: 400, method: "limb-points" as const, limbPoints: limb([0, 100, 220]) },
    };
    expect(measureTracing({ document, orientation: TEST_SUN }).problems[0]!.message).toMatch(
      /does not match the circle/,
    );
  });
});
