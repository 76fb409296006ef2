import { describe, expect, it } from "vitest";

import { buildDemoScenario } from "@/lib/demo/scenario";
import { buildDemoTracings, DEMO_TRACERS } from "@/lib/demo/tracings";
import { solarOrientation } from "@/lib/solar/ephemeris";
import { measureTracing } from "@/lib/tracer/measure";
import { checkTracingDocument } from "@/lib/validation/tracing";

describe("demo tracings (invented data)", () => {
  const scenario = buildDemoScenario();
  const before = JSON.stringify(scenario.observations);
  const tracings = buildDemoTracings({ observations: scenario.observations });

  it("leaves the demo's counts exactly as they were, and is deterministic", () => {
    expect(JSON.stringify(scenario.observations)).toBe(before);
    const again = buildDemoTracings({ observations: scenario.observations });
    expect([...again.keys()]).toEqual([...tracings.keys()]);
    const [first] = tracings.keys();
    expect(again.get(first!)).toEqual(tracings.get(first!));
  });

  it("draws every split count of the tracing observers on their weekday, and nothing else", () => {
    const expected = scenario.observations.flatMap((o, i) =>
      DEMO_TRACERS[o.observerKey] === o.observedAt.getUTCDay() && o.northGroups !== null ? [i] : [],
    );
    // About two observers × 52 weeks × 3 years × their clear-sky share.
    expect(expected.length).toBeGreaterThan(100);
    expect([...tracings.keys()]).toEqual(expected);
  });

  it("gives drawings the Disk tracer accepts, which measure to exactly the logged counts", () => {
    for (const [index, { document, groups }] of tracings) {
      const observation = scenario.observations[index]!;
      expect(checkTracingDocument(document).ok).toBe(true);
      // Measured again from the drawing alone, as the server does on a save.
      const measured = measureTracing({ document, orientation: solarOrientation(observation.observedAt) });
      expect(measured.problems).toEqual([]);
      expect(measured.counts).toEqual({
        groups: observation.groups,
        spots: observation.spots,
        northGroups: observation.northGroups,
        northSpots: observation.northSpots,
        southGroups: observation.southGroups,
        southSpots: observation.southSpots,
      });
      expect(groups).toEqual(measured.groups);
      for (const group of groups) expect(group.hemisphere).toBe(group.latitudeDeg >= 0 ? "N" : "S");
    }
  });

  it("drifts towards the equator over the demo period, as the invented model says", () => {
    const meanDistance = (fromDay: string, toDay: string) => {
      const lats = [...tracings].flatMap(([index, { groups }]) => {
        const day = scenario.observations[index]!.utDate;
        return day >= fromDay && day < toDay ? groups.map((g) => Math.abs(g.latitudeDeg)) : [];
      });
      return lats.reduce((a, b) => a + b, 0) / lats.length;
    };
    const firstYear = meanDistance("2023-12-01", "2024-12-01");
    const lastYear = meanDistance("2025-12-01", "2026-12-01");
    expect(firstYear).toBeGreaterThan(18);
    expect(lastYear).toBeLessThan(17);
  });
});
