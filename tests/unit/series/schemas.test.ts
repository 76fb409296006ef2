import { describe, expect, it } from "vitest";

import { kSettingsSchema } from "@/lib/validation/k-settings";
import { parseSeriesPath, seriesQuerySchema } from "@/lib/validation/series-query";

describe("seriesQuerySchema", () => {
  it("gives defaults and splits the sort", () => {
    expect(seriesQuerySchema("daily").parse({})).toEqual({
      hemisphere: "all",
      page: 1,
      pageSize: 50,
      sort: { column: "day", direction: "desc" },
      format: "json",
    });
    expect(
      seriesQuerySchema("monthly").parse({ sort: "smoothed:asc", from: "2024-01", page: "3" }),
    ).toMatchObject({
      sort: { column: "smoothed", direction: "asc" },
      from: "2024-01",
      page: 3,
    });
  });

  it("checks bounds per kind, the order of from and to, and unknown parameters", () => {
    const daily = seriesQuerySchema("daily");
    expect(daily.safeParse({ from: "2024-02-30" }).success).toBe(false);
    expect(daily.safeParse({ sort: "smoothed:asc" }).success).toBe(false);
    const reversed = daily.safeParse({ from: "2024-03-01", to: "2024-02-01" });
    expect(reversed.success || reversed.error.issues[0]!.path).toEqual(["to"]);
    expect(seriesQuerySchema("yearly").safeParse({ from: "24" }).success).toBe(false);
    expect(daily.safeParse({ pageSize: "501" }).success).toBe(false);
    const unknown = daily.safeParse({ colour: "red" });
    expect(unknown.success || unknown.error.issues[0]!.message).toBe("Unknown query parameter: colour.");
  });

  it("reads the kind and CSV from the path", () => {
    expect(parseSeriesPath("daily")).toEqual({ kind: "daily", csv: false });
    expect(parseSeriesPath("yearly.csv")).toEqual({ kind: "yearly", csv: true });
    expect(parseSeriesPath("weekly")).toBeNull();
  });
});

describe("kSettingsSchema", () => {
  const form = {
    periodKind: "year",
    method: "ratio-of-sums",
    minCommonDays: "20",
    referenceSeriesId: "network",
    pilotObserverId: "",
    pilotK: "1,0",
    driftFraction: "0.1",
  };

  it("reads form text: empty pilot is automatic, a decimal comma is accepted", () => {
    expect(kSettingsSchema.parse(form)).toEqual({
      ...form,
      minCommonDays: 20,
      pilotObserverId: null,
      pilotK: 1,
      driftFraction: 0.1,
    });
  });

  it("says what is wrong with each field", () => {
    const result = kSettingsSchema.safeParse({
      ...form,
      periodKind: "month",
      minCommonDays: "",
      pilotK: "0",
      driftFraction: "2",
    });
    expect(result.success).toBe(false);
    if (!result.success) {
      expect(Object.fromEntries(result.error.issues.map((i) => [i.path.join("."), i.message]))).toEqual({
        periodKind: "Choose quarter or year.",
        minCommonDays: "Enter the minimum of common days.",
        pilotK: "The pilot's k must be at least 0.1.",
        driftFraction: "The drift threshold can be at most 1.",
      });
    }
  });
});
