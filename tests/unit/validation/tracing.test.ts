import { describe, expect, it } from "vitest";

import {
  checkTracingDocument,
  createEmptyTracing,
  MAX_TRACING_BYTES,
  solarOrientationQuerySchema,
  tracingDocumentSchema,
} from "@/lib/validation/tracing";

import { makeOrientedTracing } from "../tracer/support";

describe("the tracing format", () => {
  it("accepts an empty and an oriented tracing, unchanged", () => {
    for (const doc of [createEmptyTracing(), makeOrientedTracing()]) {
      const result = checkTracingDocument(JSON.parse(JSON.stringify(doc)));
      expect(result.ok).toBe(true);
      if (result.ok) expect(result.document).toEqual(doc);
    }
  });

  it("refuses another format, a newer version and unknown fields", () => {
    const foreign = checkTracingDocument({ format: "something-else", version: 1 });
    expect(foreign.ok).toBe(false);
    if (!foreign.ok) expect(foreign.issues[0]!.message).toMatch(/Not a Heliotally tracing/);
    const newer = checkTracingDocument({ ...createEmptyTracing(), version: 2 });
    if (newer.ok) throw new Error("should fail");
    expect(newer.message).toMatch(/version 2, newer/);
    const extra = checkTracingDocument({ ...createEmptyTracing(), colour: "red" });
    if (extra.ok) throw new Error("should fail");
    expect(extra.issues[0]!.message).toBe("Unknown field: colour.");
  });

  it("refuses a tracing over 2 MB before looking inside", () => {
    const big = {
      ...createEmptyTracing(),
      background: { ...createEmptyTracing().background, imageUrl: "x".repeat(MAX_TRACING_BYTES) },
    };
    const result = checkTracingDocument(big);
    expect(result).toMatchObject({ ok: false, tooLarge: true });
    if (!result.ok) expect(result.message).toMatch(/at most 2 MB/);
  });

  it("refuses an invalid class with the rule it breaks", () => {
    const doc = makeOrientedTracing();
    doc.groups = [{ id: "g", number: 1, zurichClass: null, mcintoshClass: "Bxc", area: null }];
    doc.spots = [{ id: "s", x: 500, y: 500, umbraRadius: 3, penumbraRadius: null, groupId: "g", area: null }];
    const result = tracingDocumentSchema.safeParse(doc);
    expect(result.success).toBe(false);
    expect(result.error?.issues[0]?.message).toMatch(/compact \(c\) group/);
    const zurich = tracingDocumentSchema.safeParse({
      ...doc,
      groups: [{ ...doc.groups[0]!, mcintoshClass: null, zurichClass: "I" }],
    });
    expect(zurich.error?.issues[0]?.message).toMatch(/Zurich class is one of/);
  });

  it("checks references and sizes inside the tracing", () => {
    const doc = makeOrientedTracing();
    doc.spots = [
      { id: "s", x: 500, y: 500, umbraRadius: 3, penumbraRadius: 2, groupId: "missing", area: null },
      { id: "s", x: 510, y: 500, umbraRadius: 3, penumbraRadius: null, groupId: null, area: null },
    ];
    const messages = tracingDocumentSchema.safeParse(doc).error?.issues.map((i) => i.message) ?? [];
    expect(messages).toEqual(
      expect.arrayContaining([
        "A spot belongs to group missing, which is not in the tracing.",
        "A spot's penumbra must be at least as large as its umbra.",
        "Two spots share the id s.",
      ]),
    );
  });
});

describe("solarOrientationQuerySchema", () => {
  it("reads an ISO instant", () => {
    expect(solarOrientationQuerySchema.parse({ at: "2026-03-14T09:30:00Z" }).at.toISOString()).toBe(
      "2026-03-14T09:30:00.000Z",
    );
  });

  it("explains a missing or bad instant", () => {
    expect(solarOrientationQuerySchema.safeParse({}).error?.issues[0]?.message).toMatch(/Give the instant/);
    expect(solarOrientationQuerySchema.safeParse({ at: "yesterday" }).error?.issues[0]?.message).toMatch(
      /ISO 8601/,
    );
    expect(
      solarOrientationQuerySchema.safeParse({ at: "2400-01-01T00:00:00Z" }).error?.issues[0]?.message,
    ).toMatch(/1600 and 2200/);
  });
});
