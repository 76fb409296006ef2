import { describe, expect, it } from "vitest";

import { collectInstrumentErrors, localiseInstrumentMessage } from "@/lib/validation/instrument-messages";
import { instrumentInputSchema } from "@/lib/validation/instrument";
import { plannerSettingsSchema } from "@/lib/validation/planner";
import { unitPreferenceSchema } from "@/lib/validation/preferences";

import { buildInstrumentDraft } from "@/lib/instruments/profile";

function errorsFor(values: Record<string, string>, unitSystem: "metric" | "imperial") {
  const result = instrumentInputSchema.safeParse(buildInstrumentDraft({ values, unitSystem }));
  if (result.success) throw new Error("expected a failure");
  return collectInstrumentErrors({ issues: result.error.issues, unitSystem });
}

const imperialMirror = {
  kind: "mirror",
  name: "Porch mirror",
  mirrorSizeMm: "4",
  maskDiameterMm: "6",
  throwDistanceMm: "35",
  incidenceAngleDeg: "20",
  surface: "second",
};

describe("messages in the units of the box", () => {
  it("quotes a mask larger than the mirror in inches for an imperial observer", () => {
    expect(errorsFor(imperialMirror, "imperial").maskDiameterMm).toBe(
      "The mask opening (6 in) can't be larger than the mirror (4 in).",
    );
  });

  it("tidies the float noise of converted values in metric too", () => {
    const message = localiseInstrumentMessage({
      field: "maskDiameterMm",
      message: "The mask opening (17.779999999999998 mm) can't be larger than the mirror (12.7 mm).",
      unitSystem: "metric",
    });
    expect(message).toBe("The mask opening (17.78 mm) can't be larger than the mirror (12.7 mm).");
  });

  it("asks for a missing throw in the box's unit", () => {
    const rest: Record<string, string> = { ...imperialMirror };
    delete rest.throwDistanceMm;
    expect(errorsFor({ ...rest, maskDiameterMm: "0.25" }, "imperial").throwDistanceMm).toBe(
      "Enter the throw distance (ft).",
    );
    expect(errorsFor({ ...rest, maskDiameterMm: "6" }, "metric").throwDistanceMm).toBe(
      "Enter the throw distance (m).",
    );
  });

  it("points a unit slip at the unit actually typed", () => {
    const errors = errorsFor(
      { kind: "pinhole", name: "Box", holeDiameterMm: "3", boxLengthMm: "1000" },
      "imperial",
    );
    expect(errors.holeDiameterMm).toMatch(/Check the units: the diameter is in inches\.$/);
  });

  it("leaves the eyepiece's focal length in mm, as printed on it", () => {
    const errors = errorsFor(
      {
        kind: "eyepiece-projection",
        name: "Refractor",
        apertureMm: "3",
        focalLengthMm: "900",
        eyepieceFocalLengthMm: "25",
        eyepieceToScreenMm: "0.5",
      },
      "imperial",
    );
    expect(errors.eyepieceToScreenMm).toMatch(/than its focal length \(25 mm\)/);
  });

  it("leaves messages of fields that are not lengths alone", () => {
    const errors = errorsFor(
      { ...imperialMirror, maskDiameterMm: "0.25", incidenceAngleDeg: "-5" },
      "imperial",
    );
    expect(errors.incidenceAngleDeg).toBe("The angle of incidence cannot be negative.");
  });
});

describe("plannerSettingsSchema", () => {
  it("plans at noon UT on the chosen day", () => {
    const parsed = plannerSettingsSchema.parse({ date: "2026-03-20", targetBlurPercent: "7" });
    expect(parsed.date.toISOString()).toBe("2026-03-20T12:00:00.000Z");
    expect(parsed.targetBlurPercent).toBe(7);
  });

  it("refuses a day that does not exist rather than rolling it over", () => {
    expect(plannerSettingsSchema.safeParse({ date: "2026-04-31", targetBlurPercent: "7" }).success).toBe(
      false,
    );
    expect(plannerSettingsSchema.safeParse({ date: "31/04/2026", targetBlurPercent: "7" }).success).toBe(
      false,
    );
  });

  it("refuses a blur target that is blank, zero or absurd", () => {
    for (const targetBlurPercent of ["", "0", "45", "seven"]) {
      expect(plannerSettingsSchema.safeParse({ date: "2026-03-20", targetBlurPercent }).success).toBe(false);
    }
  });
});

describe("unitPreferenceSchema", () => {
  it("accepts metric and imperial only", () => {
    expect(unitPreferenceSchema.safeParse({ unitSystem: "imperial" }).success).toBe(true);
    expect(unitPreferenceSchema.safeParse({ unitSystem: "furlongs" }).success).toBe(false);
  });
});
