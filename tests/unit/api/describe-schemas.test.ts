import { describe, expect, it } from "vitest";

import { describeBody, describeParameters } from "@/lib/api/openapi";
import { diskTemplateQuerySchema } from "@/lib/validation/disk-template";
import { instrumentInputSchema } from "@/lib/validation/instrument";

type Variant = { properties: Record<string, { type?: string; exclusiveMinimum?: number; maximum?: number }> };

describe("describeBody", () => {
  it("describes form numbers that are checked before coercion as the numbers they become", () => {
    const body = describeBody(instrumentInputSchema) as { oneOf: Variant[] };
    const mirror = body.oneOf.find((v) => (v.properties.kind as { const?: string }).const === "mirror")!;
    // mirrorSizeMm is z.unknown() refined then piped into a positive number of at most 1000.
    expect(mirror.properties.mirrorSizeMm).toEqual({ type: "number", exclusiveMinimum: 0, maximum: 1000 });
    expect(mirror.properties.incidenceAngleDeg).toMatchObject({ type: "number", minimum: 0, maximum: 85 });
  });
});

describe("describeParameters", () => {
  it("lets a route mark a parameter optional that a preprocess step fills in", () => {
    const required = (alsoOptional: string[]) =>
      describeParameters(diskTemplateQuerySchema, "query", {}, [], alsoOptional)
        .filter((p) => p.required)
        .map((p) => p.name);
    expect(required([])).toEqual(["date", "diameterMm"]);
    expect(required(["diameterMm"])).toEqual(["date"]);
  });
});
