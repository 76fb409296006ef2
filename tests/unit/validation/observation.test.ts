import { describe, expect, it } from "vitest";

import { makeObservationInputSchema } from "@/lib/validation/observation";

const now = new Date("2026-06-01T12:00:00Z");
const schema = makeObservationInputSchema({ now: () => now });
const base = { observedAt: "2026-06-01T09:30:00Z", seeing: 2, instrumentId: "inst-1", groups: 3, spots: 17 };

function issuesOf(input: unknown) {
  const result = schema.safeParse(input);
  if (result.success) return [];
  return result.error.issues.map((i) => ({ path: i.path.join("."), message: i.message }));
}

describe("observation input schema", () => {
  it("accepts a plain count and turns text from forms into numbers", () => {
    const result = schema.parse({ ...base, seeing: "2", groups: "3", spots: " 17 " });
    expect(result).toMatchObject({ seeing: 2, groups: 3, spots: 17 });
    expect(result.observedAt.toISOString()).toBe("2026-06-01T09:30:00.000Z");
  });

  it("accepts a spotless day (g = 0, s = 0)", () => {
    expect(issuesOf({ ...base, groups: 0, spots: 0 })).toEqual([]);
  });

  it("accepts an instant with a time-zone offset and keeps it in UT", () => {
    const result = schema.parse({ ...base, observedAt: "2026-06-01T11:30:00+02:00" });
    expect(result.observedAt.toISOString()).toBe("2026-06-01T09:30:00.000Z");
  });

  it("treats an empty box as missing, not as zero", () => {
    expect(issuesOf({ ...base, groups: "" })).toEqual([
      { path: "groups", message: "Enter the number of groups." },
    ]);
  });

  it.each([
    [{ groups: 1.5 }, "groups", "whole number"],
    [{ spots: -1 }, "spots", "cannot be negative"],
    [{ groups: 4, spots: 3 }, "spots", "Fewer spots than groups"],
    [{ groups: 0, spots: 2 }, "spots", "no groups"],
    [{ seeing: 0 }, "seeing", "at least 1"],
    [{ seeing: 6 }, "seeing", "more than 5"],
    [{ observedAt: "2026-06-01T12:10:00Z" }, "observedAt", "in the future"],
    [{ observedAt: "1609-06-01T12:00:00Z" }, "observedAt", "before 1610"],
    [{ observedAt: "2026-06-01" }, "observedAt", "ISO 8601"],
    [{ instrumentId: "" }, "instrumentId", "Choose the instrument"],
    [{ notes: "x".repeat(2001) }, "notes", "at most 2000"],
  ])("refuses %o with a message on %s", (patch, path, text) => {
    const issues = issuesOf({ ...base, ...patch });
    expect(issues.find((i) => i.path === path)?.message).toContain(text);
  });

  it("allows five minutes of clock drift into the future", () => {
    expect(issuesOf({ ...base, observedAt: "2026-06-01T12:04:00Z" })).toEqual([]);
  });

  it("requires all four hemisphere counts or none", () => {
    const issues = issuesOf({ ...base, northGroups: 2, southGroups: 1 });
    expect(issues.map((i) => i.path).sort()).toEqual(["northSpots", "southSpots"]);
  });

  it("checks that hemispheres add up to the totals", () => {
    const issues = issuesOf({ ...base, northGroups: 2, northSpots: 10, southGroups: 2, southSpots: 7 });
    expect(issues).toEqual([
      { path: "northGroups", message: expect.stringContaining("(2 + 2) must add up to the total of 3") },
    ]);
    expect(issuesOf({ ...base, northGroups: 2, northSpots: 10, southGroups: 1, southSpots: 7 })).toEqual([]);
  });

  it("checks each hemisphere on its own", () => {
    const issues = issuesOf({
      ...base,
      groups: 3,
      spots: 17,
      northGroups: 3,
      northSpots: 17,
      southGroups: 0,
      southSpots: 0,
    });
    expect(issues).toEqual([]);
    const bad = issuesOf({
      ...base,
      groups: 2,
      spots: 17,
      northGroups: 2,
      northSpots: 1,
      southGroups: 0,
      southSpots: 16,
    });
    expect(bad.map((i) => i.path)).toEqual(expect.arrayContaining(["northSpots", "southSpots"]));
  });

  it("refuses unknown fields", () => {
    expect(issuesOf({ ...base, temperature: 21 })[0]?.message).toBe("Unknown field: temperature.");
  });
});
