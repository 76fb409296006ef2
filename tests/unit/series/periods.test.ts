import { describe, expect, it } from "vitest";

import {
  describeMonthDays,
  describePeriod,
  describePeriodOfDay,
  findPeriodIndex,
  formatMonth,
  listMonthDays,
  parseMonth,
} from "@/lib/series/periods";

describe("k periods", () => {
  it("numbers quarters and years so that consecutive periods differ by one", () => {
    expect(findPeriodIndex({ day: "2024-03-31", kind: "quarter" }) + 1).toBe(
      findPeriodIndex({ day: "2024-04-01", kind: "quarter" }),
    );
    expect(findPeriodIndex({ day: "2024-12-31", kind: "quarter" }) + 1).toBe(
      findPeriodIndex({ day: "2025-01-01", kind: "quarter" }),
    );
    expect(findPeriodIndex({ day: "2024-12-31", kind: "year" })).toBe(2024);
  });

  it("describes each quarter with its first and last day (leap February included)", () => {
    const q1 = describePeriodOfDay({ day: "2024-02-29", kind: "quarter" });
    expect(q1).toMatchObject({ start: "2024-01-01", end: "2024-03-31", label: "2024 Q1" });
    expect(describePeriodOfDay({ day: "2023-05-05", kind: "quarter" })).toMatchObject({
      start: "2023-04-01",
      end: "2023-06-30",
      label: "2023 Q2",
    });
    expect(describePeriodOfDay({ day: "2023-08-05", kind: "quarter" })).toMatchObject({
      start: "2023-07-01",
      end: "2023-09-30",
    });
    expect(describePeriodOfDay({ day: "2023-12-31", kind: "quarter" })).toMatchObject({
      start: "2023-10-01",
      end: "2023-12-31",
      label: "2023 Q4",
    });
    expect(describePeriod({ index: 2025, kind: "year" })).toMatchObject({
      start: "2025-01-01",
      end: "2025-12-31",
      label: "2025",
    });
  });
});

describe("months", () => {
  it("parses and formats YYYY-MM", () => {
    expect(parseMonth("2024-02")).toBe(2024 * 12 + 1);
    expect(formatMonth(2024 * 12 + 1)).toBe("2024-02");
    for (const bad of ["2024-13", "2024-2", "24-02", "2024-00", "2024-02-01"])
      expect(parseMonth(bad), bad).toBeNull();
  });

  it("knows the days of a month", () => {
    expect(describeMonthDays(parseMonth("2024-02")!)).toEqual({ first: "2024-02-01", last: "2024-02-29" });
    expect(describeMonthDays(parseMonth("2023-12")!)).toEqual({ first: "2023-12-01", last: "2023-12-31" });
    expect(listMonthDays(parseMonth("2023-02")!)).toHaveLength(28);
  });
});
