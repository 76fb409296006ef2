import { describe, expect, it } from "vitest";

import {
  chooseScaleBar,
  computeSetupDiagram,
  describeIncidenceInset,
  layoutSideView,
  roundDownToNice,
} from "@/lib/optics/diagram";
import { planProjection } from "@/lib/optics/planner";
import type { InstrumentOptics, MirrorOptics } from "@/lib/optics/types";

const mirror: MirrorOptics = {
  kind: "mirror",
  mirrorSizeMm: 50,
  maskDiameterMm: 6,
  throwDistanceMm: 10_500,
  incidenceAngleDeg: 40,
  surface: "second",
};

function diagramFor(instrument: InstrumentOptics, unitSystem: "metric" | "imperial" = "metric") {
  const plan = planProjection({ instrument });
  return { plan, diagram: computeSetupDiagram({ instrument, plan, unitSystem }) };
}

describe("roundDownToNice and chooseScaleBar", () => {
  it("picks 1, 2 or 5 × a power of ten, never above the limit", () => {
    expect(roundDownToNice({ value: 3.9 })).toBe(2);
    expect(roundDownToNice({ value: 49 })).toBe(20);
    expect(roundDownToNice({ value: 50 })).toBe(50);
    expect(roundDownToNice({ value: 0.07 })).toBeCloseTo(0.05, 12);
  });

  it("labels metric bars in the unit that reads best", () => {
    expect(chooseScaleBar({ maxLengthMm: 3500, unitSystem: "metric" })).toEqual({
      lengthMm: 2000,
      label: "2 m",
    });
    expect(chooseScaleBar({ maxLengthMm: 260, unitSystem: "metric" })).toEqual({
      lengthMm: 200,
      label: "20 cm",
    });
    expect(chooseScaleBar({ maxLengthMm: 60, unitSystem: "metric" })).toEqual({
      lengthMm: 50,
      label: "50 mm",
    });
  });

  it("uses round inches and feet in imperial", () => {
    expect(chooseScaleBar({ maxLengthMm: 3500, unitSystem: "imperial" })).toEqual({
      lengthMm: 3048,
      label: "10 ft",
    });
    expect(chooseScaleBar({ maxLengthMm: 60, unitSystem: "imperial" })).toEqual({
      lengthMm: 50.8,
      label: "2 in",
    });
    expect(chooseScaleBar({ maxLengthMm: 8, unitSystem: "imperial" })).toEqual({
      lengthMm: 6.35,
      label: "1/4 in",
    });
  });

  it("refuses a length that is not positive", () => {
    expect(() => chooseScaleBar({ maxLengthMm: 0, unitSystem: "metric" })).toThrow(RangeError);
  });
});

describe("the side view is to scale along the light", () => {
  it("places stations in proportion to their distances, with one scale bar in the same scale", () => {
    const view = layoutSideView({
      stations: [
        { key: "objective", xMm: 0, halfHeightMm: 40 },
        { key: "prime-focus", xMm: 900, halfHeightMm: 4 },
        { key: "card", xMm: 1200, halfHeightMm: 45 },
      ],
      widthPx: 640,
      heightPx: 220,
      unitSystem: "metric",
    });
    const [a, b, c] = view.stations;
    expect((b!.xPx - a!.xPx) / (c!.xPx - a!.xPx)).toBeCloseTo(900 / 1200, 10);
    expect(view.scaleBar.widthPx / view.scaleBar.lengthMm).toBeCloseTo(view.pxPerMmAlong, 10);
    // Heights use their own stated factor, a round one, and still fit the drawing.
    expect([1, 2, 5, 10, 20, 50, 100]).toContain(view.heightExaggeration);
    expect(c!.halfHeightPx / c!.halfHeightMm).toBeCloseTo(view.pxPerMmAlong * view.heightExaggeration, 10);
    expect(Math.max(...view.stations.map((s) => s.halfHeightPx))).toBeLessThanOrEqual(220 / 2);
    expect(view.beams).toHaveLength(2);
  });

  it("keeps the pinhole's disk growing in proportion to the box: disk over hole as in millimetres", () => {
    const instrument: InstrumentOptics = { kind: "pinhole", holeDiameterMm: 1.4, boxLengthMm: 1800 };
    const { plan, diagram } = diagramFor(instrument);
    const [hole, card] = diagram.side!.stations;
    expect(card!.halfHeightPx / hole!.halfHeightPx).toBeCloseTo(
      (plan as { diskDiameterMm: number }).diskDiameterMm / 1.4,
      8,
    );
  });

  it("puts the eyepiece where a thin lens images the prime focus onto the card", () => {
    const instrument: InstrumentOptics = {
      kind: "eyepiece-projection",
      apertureMm: 80,
      focalLengthMm: 900,
      eyepieceFocalLengthMm: 25,
      eyepieceToScreenMm: 300,
    };
    const stations = diagramFor(instrument).diagram.side!.stations;
    const prime = stations.find((s) => s.key === "prime-focus")!;
    const eyepiece = stations.find((s) => s.key === "eyepiece")!;
    const card = stations.find((s) => s.key === "card")!;
    const u = eyepiece.xMm - prime.xMm;
    const s = card.xMm - eyepiece.xMm;
    // 1/u + 1/s = 1/f (thin lens).
    expect(1 / u + 1 / s).toBeCloseTo(1 / 25, 12);
    expect(s).toBeCloseTo(300, 10);
  });

  it("draws the mirror's angle of incidence with true angles", () => {
    const inset = describeIncidenceInset({ angleDeg: 25, center: { x: 50, y: 50 }, radiusPx: 30 });
    const angleOf = (p: { x: number; y: number }) => Math.atan2(-(p.y - 50), p.x - 50) * (180 / Math.PI);
    const normal = angleOf(inset.normalTo);
    expect(angleOf(inset.sunFrom) - normal).toBeCloseTo(25, 10);
    expect(normal - angleOf(inset.reflectedTo)).toBeCloseTo(25, 10);
    // The mirror is square to its normal.
    const [m1, m2] = inset.mirrorEnds;
    const mirrorDir = { x: m2.x - m1.x, y: m2.y - m1.y };
    const normalDir = { x: inset.normalTo.x - 50, y: inset.normalTo.y - 50 };
    expect(mirrorDir.x * normalDir.x + mirrorDir.y * normalDir.y).toBeCloseTo(0, 9);
  });

  it("has no side view for a telescope used by eye", () => {
    const { diagram } = diagramFor({
      kind: "filtered-telescope",
      apertureMm: 90,
      magnification: 50,
      filter: "film",
    });
    expect(diagram.side).toBeNull();
    expect(diagram.face.subject).toBe("eyepiece");
    expect(diagram.face.fieldRadiusPx).not.toBeNull();
  });
});

describe("the face view keeps the card's sizes in proportion", () => {
  it("draws the mirror's disk stretched by the plan's elongation, with its mask, ghost and blur on one scale", () => {
    const { plan, diagram } = diagramFor(mirror);
    if (plan.kind !== "mirror") throw new Error("expected a mirror plan");
    const face = diagram.face;
    expect(face.diskRadiusXPx / face.diskRadiusYPx).toBeCloseTo(plan.elongation, 10);
    const pxPerMm = (2 * face.diskRadiusYPx) / plan.diskDiameterMm;
    expect(face.apertureDiameterPx! / pxPerMm).toBeCloseTo(6, 10);
    expect(face.ghostOffsetPx! / pxPerMm).toBeCloseTo(plan.ghost!.offsetMm, 10);
    expect(face.blurWidthPx / (2 * face.diskRadiusYPx)).toBeCloseTo(plan.combinedBlur.fractionOfDisk, 10);
    expect(face.smallestSpotDiameterPx / (2 * face.diskRadiusYPx)).toBeCloseTo(
      plan.smallestSpot.arcsec / plan.sunDiameterArcsec,
      10,
    );
    expect(face.scaleBar!.widthPx / face.scaleBar!.lengthMm).toBeCloseTo(pxPerMm, 10);
    // The whole stretched disk and its ghost fit the drawing.
    expect(2 * face.diskRadiusXPx + face.ghostOffsetPx!).toBeLessThanOrEqual(face.sizePx);
  });

  it("shows a camera's disk on the sensor without an opening", () => {
    const { diagram } = diagramFor({ kind: "camera", focalLengthMm: 600, pixelSizeUm: 3.76, filter: "film" });
    expect(diagram.face.subject).toBe("sensor");
    expect(diagram.face.apertureDiameterPx).toBeNull();
    expect(diagram.side!.stations.map((s) => s.key)).toEqual(["lens", "sensor"]);
  });

  it("labels the scale bar in imperial for an imperial observer", () => {
    const { diagram } = diagramFor(mirror, "imperial");
    expect(diagram.face.scaleBar!.label).toMatch(/in$/);
    expect(diagram.side!.scaleBar.label).toMatch(/ft$/);
  });
});
