import { describe, expect, it } from "vitest";

import { describeIncidenceEffect } from "@/lib/optics/incidence-effect";
import {
  formatArcsec,
  formatBlur,
  formatFraction,
  formatKm,
  localisePlanMessage,
} from "@/lib/optics/plan-format";
import type { MirrorOptics } from "@/lib/optics/types";

const mirror: MirrorOptics = {
  kind: "mirror",
  mirrorSizeMm: 50,
  maskDiameterMm: 6,
  throwDistanceMm: 10_500,
  incidenceAngleDeg: 20,
  surface: "second",
};

describe("describeIncidenceEffect", () => {
  const rows = describeIncidenceEffect({ instrument: mirror });

  it("includes the observer's own angle among the steps, marked", () => {
    expect(rows.map((r) => r.incidenceAngleDeg)).toEqual([0, 15, 20, 30, 45, 60, 75]);
    expect(rows.filter((r) => r.isCurrent).map((r) => r.incidenceAngleDeg)).toEqual([20]);
  });

  it("stretches the disk by 1 / cos i", () => {
    for (const row of rows)
      expect(row.elongation).toBeCloseTo(1 / Math.cos((row.incidenceAngleDeg * Math.PI) / 180), 12);
  });

  it("blurs more, and brightens the ghost, as the reflection turns glancing (common practice, PRODUCT.md)", () => {
    for (let i = 1; i < rows.length; i += 1) {
      expect(rows[i]!.combinedBlurFraction).toBeGreaterThanOrEqual(rows[i - 1]!.combinedBlurFraction - 1e-12);
      expect(rows[i]!.blurOnCardMm).toBeGreaterThan(rows[i - 1]!.blurOnCardMm);
      expect(rows[i]!.ghostRelativeBrightness!).toBeGreaterThan(rows[i - 1]!.ghostRelativeBrightness!);
    }
    expect(rows.at(-1)!.combinedBlurFraction).toBeGreaterThan(rows[0]!.combinedBlurFraction * 1.2);
  });

  it("has no ghost for a first-surface mirror", () => {
    const first = describeIncidenceEffect({ instrument: { ...mirror, surface: "first" } });
    expect(first.every((r) => r.ghostRelativeBrightness === null)).toBe(true);
  });
});

describe("plan formatting", () => {
  it("prints arcseconds, and minutes beyond a minute", () => {
    expect(formatArcsec({ arcsec: 3.46 })).toBe("3.5″");
    expect(formatArcsec({ arcsec: 46.2 })).toBe("46″");
    expect(formatArcsec({ arcsec: 127 })).toBe("2′ 7″");
    expect(formatArcsec({ arcsec: 119.7 })).toBe("2′ 0″");
  });

  it("prints fractions as percentages with sensible figures", () => {
    expect(formatFraction({ fraction: 0.0654 })).toBe("6.5 %");
    expect(formatFraction({ fraction: 0.0012 })).toBe("0.12 %");
  });

  it("calls a blur of zero what it is", () => {
    expect(formatBlur({ blur: { arcsec: 0, fractionOfDisk: 0 } })).toBe("none (in focus)");
    expect(formatBlur({ blur: { arcsec: 46.2, fractionOfDisk: 0.024 } })).toBe("46″ · 2.4 % of the disk");
  });

  it("rounds kilometres on the Sun to 100 km", () => {
    expect(formatKm({ km: 22_163 })).toBe("22,200 km");
  });
});

describe("localisePlanMessage", () => {
  const ghost =
    "A faint second image (about 29 % as bright) sits 2.2 mm beside the disk; throw the image about 10.7 m or 23,000 km.";

  it("leaves metric messages untouched", () => {
    expect(localisePlanMessage({ message: ghost, unitSystem: "metric" })).toBe(ghost);
  });

  it("turns mm and m into inches and feet for an imperial observer, not km or %", () => {
    expect(localisePlanMessage({ message: ghost, unitSystem: "imperial" })).toBe(
      "A faint second image (about 29 % as bright) sits 0.0866 in beside the disk; throw the image about 35.1 ft or 23,000 km.",
    );
  });
});
