import { describe, expect, it } from "vitest";

import { planProjection } from "@/lib/optics/planner";
import type { InstrumentOptics } from "@/lib/optics/types";
import { instrumentInputSchema, type InstrumentInput } from "@/lib/validation/instrument";

/** Valid form submissions, as text the way forms send them. */
const valid = {
  pinhole: { kind: "pinhole", name: "Shoebox", holeDiameterMm: "1.4", boxLengthMm: "1000" },
  mirror: {
    kind: "mirror",
    name: "Sill mirror",
    mirrorSizeMm: "50",
    maskDiameterMm: "6",
    throwDistanceMm: "10500",
    incidenceAngleDeg: "20",
    surface: "second",
  },
  eyepiece: {
    kind: "eyepiece-projection",
    name: "80 mm refractor",
    apertureMm: "80",
    focalLengthMm: "900",
    eyepieceFocalLengthMm: "25",
    eyepieceToScreenMm: "300",
  },
  camera: {
    kind: "camera",
    name: "Guide camera",
    focalLengthMm: "1000",
    pixelSizeUm: "3.76",
    filter: "white-light film",
  },
  telescope: {
    kind: "filtered-telescope",
    name: "Glass-filtered",
    apertureMm: "80",
    magnification: "40",
    filter: "glass",
  },
} as const;

/** The issues of a failed parse, as [path, message] pairs. */
function issuesOf(input: unknown): Array<[string, string]> {
  const result = instrumentInputSchema.safeParse(input);
  if (result.success) throw new Error(`expected a failure, parsed ${JSON.stringify(result.data)}`);
  return result.error.issues.map((issue) => [issue.path.join("."), issue.message]);
}

/** A copy of `input` without `key`, as a form that never sent the field. */
function without(input: Record<string, unknown>, key: string): Record<string, unknown> {
  return Object.fromEntries(Object.entries(input).filter(([k]) => k !== key));
}

function expectIssue(input: unknown, path: string, message: RegExp) {
  const issues = issuesOf(input);
  expect(
    issues.some(([p, m]) => p === path && message.test(m)),
    JSON.stringify(issues),
  ).toBe(true);
}

describe("instrumentInputSchema accepts", () => {
  it.each(Object.entries(valid))("a %s profile sent as text, coercing numbers", (_, input) => {
    const parsed = instrumentInputSchema.parse(input);
    expect(parsed.kind).toBe(input.kind);
    // The parsed profile is what the planner takes, without conversion.
    const optics: InstrumentOptics = parsed;
    expect(planProjection({ instrument: optics }).kind).toBe(input.kind);
  });

  it("a mirror with the mask left blank, and a unit system", () => {
    const parsed: InstrumentInput = instrumentInputSchema.parse({
      ...valid.mirror,
      maskDiameterMm: "",
      unitSystem: "imperial",
    });
    expect(parsed).toMatchObject({
      kind: "mirror",
      maskDiameterMm: undefined,
      throwDistanceMm: 10_500,
      unitSystem: "imperial",
    });
  });

  it("and strips fields left over from another kind", () => {
    const parsed = instrumentInputSchema.parse({ ...valid.pinhole, throwDistanceMm: "9000" });
    expect(parsed).not.toHaveProperty("throwDistanceMm");
  });
});

describe("instrumentInputSchema refuses", () => {
  it("a zero hole", () => {
    expectIssue({ ...valid.pinhole, holeDiameterMm: "0" }, "holeDiameterMm", /greater than zero/);
  });

  it("a negative throw", () => {
    expectIssue({ ...valid.mirror, throwDistanceMm: "-10500" }, "throwDistanceMm", /greater than zero/);
  });

  it("a negative angle of incidence, and one past grazing", () => {
    expectIssue({ ...valid.mirror, incidenceAngleDeg: "-5" }, "incidenceAngleDeg", /cannot be negative/);
    expectIssue({ ...valid.mirror, incidenceAngleDeg: "89" }, "incidenceAngleDeg", /85°/);
  });

  it("a pinhole over 50 mm", () => {
    expectIssue({ ...valid.pinhole, holeDiameterMm: "60" }, "holeDiameterMm", /over 50 mm.*not a pinhole/);
  });

  it("a hole that is a large part of the box length", () => {
    expectIssue(
      { ...valid.pinhole, holeDiameterMm: "20", boxLengthMm: "150" },
      "holeDiameterMm",
      /tenth of the box length/,
    );
  });

  it("a throw over 200 m", () => {
    expectIssue({ ...valid.mirror, throwDistanceMm: "250000" }, "throwDistanceMm", /over 200 m/);
  });

  it("a mask larger than the mirror", () => {
    expectIssue(
      { ...valid.mirror, mirrorSizeMm: "30", maskDiameterMm: "40" },
      "maskDiameterMm",
      /can't be larger than the mirror/,
    );
  });

  it("a screen no farther from the eyepiece than its focal length", () => {
    expectIssue(
      { ...valid.eyepiece, eyepieceToScreenMm: "20" },
      "eyepieceToScreenMm",
      /farther from the eyepiece than its focal length \(25 mm\)/,
    );
    expectIssue(
      { ...valid.eyepiece, eyepieceToScreenMm: "25" },
      "eyepieceToScreenMm",
      /farther from the eyepiece/,
    );
  });

  it("an eyepiece focal length of zero", () => {
    expectIssue({ ...valid.eyepiece, eyepieceFocalLengthMm: "0" }, "eyepieceFocalLengthMm", /can't be zero/);
  });

  it("an unknown unit system", () => {
    expectIssue({ ...valid.pinhole, unitSystem: "furlongs" }, "unitSystem", /metric or imperial/);
  });

  it("a missing field the kind needs", () => {
    expectIssue(
      without(valid.mirror, "throwDistanceMm"),
      "throwDistanceMm",
      /^Enter the throw distance \(mm\)\.$/,
    );
    expectIssue({ ...valid.pinhole, boxLengthMm: "" }, "boxLengthMm", /^Enter the box length/);
  });

  it("a pinhole sent with a mirror's fields instead of its own", () => {
    const issues = issuesOf({
      kind: "pinhole",
      name: "Mixed up",
      mirrorSizeMm: "50",
      throwDistanceMm: "9000",
    });
    expect(issues.map(([path]) => path).sort()).toEqual(["boxLengthMm", "holeDiameterMm"]);
  });

  it("text that is not a number", () => {
    expectIssue({ ...valid.camera, pixelSizeUm: "small" }, "pixelSizeUm", /must be a number/);
  });

  it("an unknown or missing kind", () => {
    expectIssue({ ...valid.pinhole, kind: "periscope" }, "kind", /Choose the kind of instrument/);
    expectIssue(without(valid.pinhole, "kind"), "kind", /Choose the kind of instrument/);
  });

  it("a camera or telescope without a named solar filter", () => {
    expectIssue({ ...valid.camera, filter: "  " }, "filter", /certified solar filter/);
    expectIssue(without(valid.telescope, "filter"), "filter", /solar filter/);
  });

  it("a mirror surface other than first or second", () => {
    expectIssue({ ...valid.mirror, surface: "third" }, "surface", /first-surface or ordinary/);
  });

  it("a blank or over-long name", () => {
    expectIssue({ ...valid.pinhole, name: "   " }, "name", /Give the instrument a name/);
    expectIssue({ ...valid.pinhole, name: "x".repeat(81) }, "name", /80 characters/);
  });
});
