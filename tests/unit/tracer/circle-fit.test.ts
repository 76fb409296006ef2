import { describe, expect, it } from "vitest";

import { fitCircle } from "@/lib/tracer/circle-fit";

function onCircle({ cx, cy, r, anglesDeg }: { cx: number; cy: number; r: number; anglesDeg: number[] }) {
  return anglesDeg.map((a) => ({
    x: cx + r * Math.cos((a * Math.PI) / 180),
    y: cy + r * Math.sin((a * Math.PI) / 180),
  }));
}

describe("fitCircle (Kåsa 1976 start, geometric least squares)", () => {
  it("recovers a circle exactly from three points", () => {
    const result = fitCircle({ points: onCircle({ cx: 512, cy: 480, r: 400, anglesDeg: [10, 130, 250] }) });
    expect(result.ok).toBe(true);
    if (!result.ok) return;
    expect(result.circle.cx).toBeCloseTo(512, 8);
    expect(result.circle.cy).toBeCloseTo(480, 8);
    expect(result.circle.r).toBeCloseTo(400, 8);
    expect(result.circle.rmsResidual).toBeLessThan(1e-8);
  });

  it("recovers a circle from points on a short arc, where the algebraic fit alone is biased", () => {
    // Deterministic ±0.5 px "hand" noise on a 40° arc.
    const points = onCircle({
      cx: 300,
      cy: 300,
      r: 250,
      anglesDeg: [70, 75, 80, 85, 90, 95, 100, 105, 110],
    }).map((p, i) => ({
      x: p.x + (i % 2 === 0 ? 0.5 : -0.5),
      y: p.y + (i % 3 === 0 ? 0.5 : -0.25),
    }));
    const result = fitCircle({ points });
    expect(result.ok).toBe(true);
    if (!result.ok) return;
    // A geometric fit of 9 points over 40° with half-pixel noise lands within a few pixels.
    expect(Math.abs(result.circle.r - 250)).toBeLessThan(8);
    expect(Math.hypot(result.circle.cx - 300, result.circle.cy - 300)).toBeLessThan(8);
  });

  it("minimises the geometric residuals: noisy points all round give the true circle closely", () => {
    const angles = Array.from({ length: 24 }, (_, i) => i * 15);
    const points = onCircle({ cx: 0, cy: 0, r: 100, anglesDeg: angles }).map((p, i) => {
      const wobble = i % 2 === 0 ? 1 : -1; // radial ±1: the best circle is r = 100 exactly
      const a = (angles[i]! * Math.PI) / 180;
      return { x: p.x + wobble * Math.cos(a), y: p.y + wobble * Math.sin(a) };
    });
    const result = fitCircle({ points });
    if (!result.ok) throw new Error(result.message);
    expect(result.circle.r).toBeCloseTo(100, 6);
    expect(result.circle.rmsResidual).toBeCloseTo(1, 6);
  });

  it("refuses fewer than three points", () => {
    const result = fitCircle({
      points: [
        { x: 0, y: 0 },
        { x: 10, y: 3 },
      ],
    });
    expect(result).toMatchObject({ ok: false, reason: "too-few" });
    if (!result.ok) expect(result.message).toMatch(/at least three/);
  });

  it("counts repeated clicks on one point once", () => {
    const result = fitCircle({
      points: [
        { x: 5, y: 5 },
        { x: 5, y: 5 },
        { x: 9, y: 1 },
      ],
    });
    expect(result).toMatchObject({ ok: false, reason: "too-few" });
  });

  it("refuses collinear points", () => {
    const result = fitCircle({
      points: [
        { x: 0, y: 0 },
        { x: 50, y: 50 },
        { x: 100, y: 100 },
        { x: 170, y: 170 },
      ],
    });
    expect(result).toMatchObject({ ok: false, reason: "collinear" });
    if (!result.ok) expect(result.message).toMatch(/straight line/);
  });

  it("refuses points that are collinear but for rounding", () => {
    const result = fitCircle({
      points: [
        { x: 0, y: 0 },
        { x: 100, y: 1e-6 },
        { x: 200, y: 0 },
      ],
    });
    expect(result).toMatchObject({ ok: false, reason: "collinear" });
  });
});
