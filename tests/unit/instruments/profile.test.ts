import { describe, expect, it } from "vitest";

import { describeInstrumentDimensions } from "@/lib/instruments/describe";
import {
  describeSafetyEmphasis,
  EXAMPLE_SETUPS,
  fillWithExample,
  INSTRUMENT_KINDS,
  KIND_FIELDS,
} from "@/lib/instruments/fields";
import {
  buildInstrumentDraft,
  convertFormValues,
  readInstrumentOptics,
  splitInstrumentInput,
  toInstrumentFormValues,
} from "@/lib/instruments/profile";
import { UNIT_SYSTEMS } from "@/lib/optics/units";
import { instrumentInputSchema } from "@/lib/validation/instrument";

describe("splitInstrumentInput", () => {
  it("keeps only the optics in params", () => {
    const input = instrumentInputSchema.parse({
      kind: "mirror",
      name: " Porch mirror ",
      notes: "",
      unitSystem: "imperial",
      mirrorSizeMm: "101.6",
      maskDiameterMm: "",
      throwDistanceMm: "10668",
      incidenceAngleDeg: "20",
      surface: "first",
    });
    expect(splitInstrumentInput({ input })).toEqual({
      name: "Porch mirror",
      kind: "mirror",
      notes: null,
      params: { mirrorSizeMm: 101.6, throwDistanceMm: 10_668, incidenceAngleDeg: 20, surface: "first" },
    });
  });
});

describe("readInstrumentOptics", () => {
  it("reads a stored row into the planner's optics", () => {
    expect(
      readInstrumentOptics({ kind: "pinhole", params: { holeDiameterMm: 1.4, boxLengthMm: 1800 } }),
    ).toEqual({
      kind: "pinhole",
      holeDiameterMm: 1.4,
      boxLengthMm: 1800,
    });
  });

  it("returns null for params that are missing, of another kind or not an object", () => {
    expect(readInstrumentOptics({ kind: "pinhole", params: {} })).toBeNull();
    expect(
      readInstrumentOptics({ kind: "mirror", params: { holeDiameterMm: 1.4, boxLengthMm: 1800 } }),
    ).toBeNull();
    expect(readInstrumentOptics({ kind: "pinhole", params: [1, 2] })).toBeNull();
    expect(readInstrumentOptics({ kind: "pinhole", params: "1.4" })).toBeNull();
  });
});

describe("form values in the observer's units", () => {
  const stored = {
    name: "Porch mirror",
    kind: "mirror",
    notes: null,
    params: {
      mirrorSizeMm: 101.6,
      maskDiameterMm: 6.35,
      throwDistanceMm: 10_668,
      incidenceAngleDeg: 20,
      surface: "first",
    },
  };

  it("shows imperial entries as typed, without the float noise of the round trip", () => {
    expect(toInstrumentFormValues({ record: stored, unitSystem: "imperial" })).toEqual({
      kind: "mirror",
      name: "Porch mirror",
      notes: "",
      mirrorSizeMm: "4",
      maskDiameterMm: "0.25",
      throwDistanceMm: "35",
      incidenceAngleDeg: "20",
      surface: "first",
    });
  });

  it("shows metric throws in metres and small sizes in mm", () => {
    const values = toInstrumentFormValues({ record: stored, unitSystem: "metric" });
    expect(values).toMatchObject({
      mirrorSizeMm: "101.6",
      maskDiameterMm: "6.35",
      throwDistanceMm: "10.668",
    });
  });

  it("converts typed values when the observer switches units, leaving non-numbers alone", () => {
    const converted = convertFormValues({
      values: {
        kind: "mirror",
        mirrorSizeMm: "4",
        maskDiameterMm: "",
        throwDistanceMm: "35",
        name: "x",
        incidenceAngleDeg: "20",
      },
      from: "imperial",
      to: "metric",
    });
    expect(converted).toEqual({
      kind: "mirror",
      mirrorSizeMm: "101.6",
      maskDiameterMm: "",
      throwDistanceMm: "10.668",
      name: "x",
      incidenceAngleDeg: "20",
    });
  });

  it("builds the schema's draft from the chosen kind only, in mm", () => {
    const draft = buildInstrumentDraft({
      values: {
        kind: "pinhole",
        name: "Box",
        holeDiameterMm: "0.04",
        boxLengthMm: "40",
        throwDistanceMm: "35",
      },
      unitSystem: "imperial",
    });
    expect(draft).not.toHaveProperty("throwDistanceMm");
    expect(draft.holeDiameterMm).toBeCloseTo(1.016, 10);
    expect(draft.boxLengthMm).toBeCloseTo(1016, 10);
    expect(draft.unitSystem).toBe("imperial");
  });
});

describe("kinds and their fields", () => {
  it("offers exactly the schema's fields for each kind", () => {
    for (const kind of INSTRUMENT_KINDS) {
      const schema = instrumentInputSchema.options.find((option) => option.shape.kind.value === kind)!;
      const optics = Object.keys(schema.shape).filter(
        (key) => !["kind", "name", "notes", "unitSystem"].includes(key),
      );
      expect(KIND_FIELDS[kind].map((f) => f.name).sort()).toEqual(optics.sort());
    }
  });

  it.each(UNIT_SYSTEMS)("gives %s example set-ups that the schema accepts", (unitSystem) => {
    for (const kind of INSTRUMENT_KINDS) {
      const values = fillWithExample({ values: { name: "Trial" }, kind, unitSystem });
      const result = instrumentInputSchema.safeParse(buildInstrumentDraft({ values, unitSystem }));
      expect(result.success, `${kind}: ${JSON.stringify(result.error?.issues)}`).toBe(true);
    }
    // The trade's mirror: a quarter-inch mask at 35 ft, or its round metric neighbour.
    const mirror = EXAMPLE_SETUPS[unitSystem].mirror;
    expect(mirror.maskDiameterMm).toBe(unitSystem === "imperial" ? "0.25" : "6");
  });

  it("keeps what was typed when filling with an example", () => {
    const values = fillWithExample({ values: { mirrorSizeMm: "75" }, kind: "mirror", unitSystem: "metric" });
    expect(values).toMatchObject({ kind: "mirror", mirrorSizeMm: "75", throwDistanceMm: "10.5" });
  });

  it("puts the mirror's beam and the optics aimed at the Sun first in the safety notice", () => {
    expect(describeSafetyEmphasis({ kind: "mirror" })).toBe("mirror");
    expect(describeSafetyEmphasis({ kind: "eyepiece-projection" })).toBe("telescope-projection");
    expect(describeSafetyEmphasis({ kind: "camera" })).toBe("filtered-optics");
    expect(describeSafetyEmphasis({ kind: "filtered-telescope" })).toBe("filtered-optics");
    expect(describeSafetyEmphasis({ kind: "pinhole" })).toBeNull();
  });
});

describe("describeInstrumentDimensions", () => {
  it("lists the sizes in each field's unit", () => {
    const params = { mirrorSizeMm: 101.6, throwDistanceMm: 10_668, incidenceAngleDeg: 20, surface: "second" };
    expect(describeInstrumentDimensions({ kind: "mirror", params, unitSystem: "imperial" })).toEqual([
      { label: "Mirror size", value: "4 in" },
      { label: "Throw distance", value: "35 ft" },
      { label: "Angle of incidence", value: "20°" },
      { label: "Mirror surface", value: "Ordinary glass mirror (second-surface)" },
    ]);
  });

  it("gives nothing for a profile without sizes", () => {
    expect(describeInstrumentDimensions({ kind: "pinhole", params: {}, unitSystem: "metric" })).toEqual([]);
  });
});
