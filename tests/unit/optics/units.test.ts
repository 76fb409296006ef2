import { describe, expect, it } from "vitest";

import {
  chooseDisplayUnit,
  convertFormLengthsToMm,
  convertLength,
  convertMmToFormLengths,
  formatLength,
  fromMillimetres,
  isUnitSystem,
  toMillimetres,
} from "@/lib/optics/units";

describe("length conversion (international inch of 1959: 1 in = 25.4 mm exactly)", () => {
  it("converts inches and feet to millimetres", () => {
    expect(toMillimetres({ value: 1, unit: "in" })).toBe(25.4);
    expect(toMillimetres({ value: 1, unit: "ft" })).toBeCloseTo(304.8, 10);
    expect(toMillimetres({ value: 0.25, unit: "in" })).toBeCloseTo(6.35, 10);
    expect(toMillimetres({ value: 35, unit: "ft" })).toBeCloseTo(10_668, 6);
  });

  it("converts between any two units", () => {
    expect(convertLength({ value: 1, from: "m", to: "cm" })).toBe(100);
    expect(convertLength({ value: 12, from: "in", to: "ft" })).toBeCloseTo(1, 10);
    expect(fromMillimetres({ valueMm: 1000, unit: "m" })).toBe(1);
  });
});

describe("formatLength", () => {
  it("picks a readable unit for each system", () => {
    expect(formatLength({ valueMm: 1.409, unitSystem: "metric" })).toBe("1.41 mm");
    expect(formatLength({ valueMm: 102.4, unitSystem: "metric" })).toBe("10.2 cm");
    expect(formatLength({ valueMm: 10_500, unitSystem: "metric" })).toBe("10.5 m");
    expect(formatLength({ valueMm: 6.35, unitSystem: "imperial" })).toBe("0.25 in");
    expect(formatLength({ valueMm: 10_668, unitSystem: "imperial" })).toBe("35 ft");
  });

  it("honours an explicit unit", () => {
    expect(formatLength({ valueMm: 10_668, unitSystem: "imperial", unit: "in" })).toBe("420 in");
  });

  it("chooses units by size", () => {
    expect(chooseDisplayUnit({ valueMm: 50, unitSystem: "metric" })).toBe("mm");
    expect(chooseDisplayUnit({ valueMm: 400, unitSystem: "imperial" })).toBe("ft");
  });
});

describe("convertFormLengthsToMm", () => {
  it("converts imperial form text to millimetres, leaving eyepiece focal lengths in mm", () => {
    const out = convertFormLengthsToMm({
      values: {
        kind: "mirror",
        name: "Sill mirror",
        maskDiameterMm: "0.25",
        throwDistanceMm: "35",
        eyepieceFocalLengthMm: "25",
      },
      unitSystem: "imperial",
    });
    expect(out.maskDiameterMm).toBeCloseTo(6.35, 10);
    expect(out.throwDistanceMm).toBeCloseTo(10_668, 6);
    expect(out.eyepieceFocalLengthMm).toBe(25);
    expect(out.name).toBe("Sill mirror");
  });

  it("converts a metric throw typed in metres", () => {
    expect(
      convertFormLengthsToMm({ values: { throwDistanceMm: "10.5" }, unitSystem: "metric" }).throwDistanceMm,
    ).toBe(10_500);
  });

  it("passes blanks and non-numbers through for the schema to report", () => {
    const out = convertFormLengthsToMm({
      values: { maskDiameterMm: "", throwDistanceMm: "far" },
      unitSystem: "imperial",
    });
    expect(out).toEqual({ maskDiameterMm: "", throwDistanceMm: "far" });
  });

  it("round-trips with convertMmToFormLengths", () => {
    const stored = { holeDiameterMm: 1.41, boxLengthMm: 1000 };
    const shown = convertMmToFormLengths({ values: stored, unitSystem: "imperial" });
    const back = convertFormLengthsToMm({ values: shown, unitSystem: "imperial" });
    expect(back.holeDiameterMm).toBeCloseTo(1.41, 10);
    expect(back.boxLengthMm).toBeCloseTo(1000, 10);
  });
});

describe("isUnitSystem", () => {
  it("accepts only metric and imperial", () => {
    expect(isUnitSystem("metric")).toBe(true);
    expect(isUnitSystem("imperial")).toBe(true);
    expect(isUnitSystem("furlongs")).toBe(false);
  });
});
