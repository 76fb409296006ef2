import { describe, expect, it } from "vitest";

import {
  fromTerrestrialJulianDate,
  fromTerrestrialTimeDays,
  getTtMinusUtcSeconds,
  toAstroTime,
  toTerrestrialTimeDays,
} from "@/lib/solar/time-scales";

describe("getTtMinusUtcSeconds", () => {
  it("uses the leap-second table from 1972 (IERS Bulletin C values, as in erfa.dat)", () => {
    expect(getTtMinusUtcSeconds(new Date("1972-01-01T00:00:00Z"))).toBeCloseTo(42.184, 9);
    expect(getTtMinusUtcSeconds(new Date("1992-06-30T23:59:59Z"))).toBeCloseTo(58.184, 9);
    expect(getTtMinusUtcSeconds(new Date("1992-07-01T00:00:00Z"))).toBeCloseTo(59.184, 9);
    expect(getTtMinusUtcSeconds(new Date("2016-12-31T23:59:59Z"))).toBeCloseTo(68.184, 9);
    expect(getTtMinusUtcSeconds(new Date("2017-01-01T00:00:00Z"))).toBeCloseTo(69.184, 9);
  });

  it("holds the last offset for future instants (no leap seconds planned; CGPM 2022)", () => {
    expect(getTtMinusUtcSeconds(new Date("2100-12-31T00:00:00Z"))).toBeCloseTo(69.184, 9);
  });

  it("uses ΔT before 1972 and joins the table without a visible jump", () => {
    // ΔT about −2.7 s in 1900 and about +29 s in 1950 (Espenak & Meeus polynomials).
    expect(getTtMinusUtcSeconds(new Date("1900-01-01T00:00:00Z"))).toBeCloseTo(-2.7, 0);
    expect(getTtMinusUtcSeconds(new Date("1950-01-01T00:00:00Z"))).toBeCloseTo(29.1, 0);
    const before = getTtMinusUtcSeconds(new Date("1971-12-31T23:59:59Z"));
    const after = getTtMinusUtcSeconds(new Date("1972-01-01T00:00:00Z"));
    expect(Math.abs(after - before)).toBeLessThan(0.1);
  });

  it("rejects an invalid Date", () => {
    expect(() => getTtMinusUtcSeconds(new Date("not a date"))).toThrow(RangeError);
  });
});

describe("TT conversions", () => {
  it("J2000.0 (2000 Jan 1 12h TT) is 64.184 s before noon UTC", () => {
    const at = fromTerrestrialJulianDate(2_451_545.0);
    expect(at.toISOString()).toBe("2000-01-01T11:58:55.816Z");
    expect(toTerrestrialTimeDays(at)).toBeCloseTo(0, 9);
  });

  it("round-trips TT days through UTC across 1900–2100", () => {
    for (let ttDays = -36_500; ttDays <= 36_500; ttDays += 1234.567) {
      const at = fromTerrestrialTimeDays(ttDays);
      expect(toTerrestrialTimeDays(at)).toBeCloseTo(ttDays, 7); // ~1 ms
    }
  });

  it("hands astronomy-engine our TT, not its own ΔT estimate", () => {
    const at = new Date("2090-06-01T00:00:00Z");
    expect(toAstroTime(at).tt).toBeCloseTo(toTerrestrialTimeDays(at), 12);
  });
});
