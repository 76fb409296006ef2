import { describe, expect, it } from "vitest";

import { buildDemoScenario } from "@/lib/demo/scenario";
import { makeObservationInputSchema } from "@/lib/validation/observation";

describe("demo scenario (invented data)", () => {
  const scenario = buildDemoScenario();

  it("is deterministic", () => {
    const again = buildDemoScenario();
    expect(again.observations.length).toBe(scenario.observations.length);
    expect(again.observations[1234]).toEqual(scenario.observations[1234]);
  });

  it("has about fourteen observers with k between 0.6 and 1.4, and six students", () => {
    expect(scenario.observers).toHaveLength(14);
    for (const o of scenario.observers) {
      expect(o.trueK).toBeGreaterThanOrEqual(0.6);
      expect(o.trueK).toBeLessThanOrEqual(1.4);
      expect(o.email.endsWith("@example.test")).toBe(true);
    }
    expect(scenario.students).toHaveLength(6);
  });

  it("produces only observations that pass the same validation as real input", () => {
    const schema = makeObservationInputSchema({ now: () => new Date("2030-01-01T00:00:00Z") });
    for (const o of scenario.observations) {
      const result = schema.safeParse({
        observedAt: o.observedAt.toISOString(),
        seeing: o.seeing,
        instrumentId: "demo",
        groups: o.groups,
        spots: o.spots,
        northGroups: o.northGroups ?? undefined,
        northSpots: o.northSpots ?? undefined,
        southGroups: o.southGroups ?? undefined,
        southSpots: o.southSpots ?? undefined,
        notes: o.notes ?? undefined,
      });
      expect(result.success, JSON.stringify(o)).toBe(true);
    }
  });

  it("leaves cloudy gaps and a few planted outliers", () => {
    const perObserver = scenario.observations.filter((o) => o.observerKey === "wren").length;
    expect(perObserver).toBeLessThan(1096 * 0.8);
    expect(perObserver).toBeGreaterThan(1096 * 0.2);
    expect(
      scenario.observations.filter((o) => o.notes?.includes("planted outlier")).length,
    ).toBeGreaterThanOrEqual(2);
  });
});
