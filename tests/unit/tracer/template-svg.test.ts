import { describe, expect, it } from "vitest";

import { solarOrientation } from "@/lib/solar/ephemeris";
import { layoutDiskTemplate, renderDiskTemplateSvg } from "@/lib/tracer/template-svg";
import { diskTemplateQuerySchema } from "@/lib/validation/disk-template";

describe("the printable disk template", () => {
  const at = new Date("1992-10-13T00:00:00Z");
  const orientation = solarOrientation(at);

  it("prints on A4 at true size with the limb circle of the chosen diameter", () => {
    const svg = renderDiskTemplateSvg({ at, orientation, diameterMm: 150, mirrored: false });
    expect(svg).toContain('width="210mm" height="297mm" viewBox="0 0 210 297"');
    expect(svg).toMatch(/<circle cx="105" cy="117" r="75" /);
  });

  it("grows the sheet for a large disk", () => {
    expect(layoutDiskTemplate({ diameterMm: 300 })).toMatchObject({ widthMm: 340, radiusMm: 150 });
  });

  it("names the day's orientation (Meeus Example 29.a: P = +26.27°, B0 = +5.99°)", () => {
    const svg = renderDiskTemplateSvg({ at, orientation, diameterMm: 150, mirrored: false });
    expect(svg).toContain("P +26.27°");
    expect(svg).toContain("B0 +5.99°");
    for (const mark of [">N<", ">S<", ">E<", ">W<", "Time (UT)", "Seeing (1–5)", "Groups g", "Spots s"])
      expect(svg).toContain(mark);
  });

  it("puts west on the right unless mirrored", () => {
    const westX = (svg: string) => Number(/<text x="([\d.]+)" y="[\d.]+">W<\/text>/.exec(svg)?.[1]);
    expect(
      westX(renderDiskTemplateSvg({ at, orientation, diameterMm: 150, mirrored: false })),
    ).toBeGreaterThan(105);
    expect(westX(renderDiskTemplateSvg({ at, orientation, diameterMm: 150, mirrored: true }))).toBeLessThan(
      105,
    );
  });

  it("reads its query with defaults and clear refusals", () => {
    expect(diskTemplateQuerySchema.parse({ date: "2026-03-14" })).toEqual({
      date: "2026-03-14",
      time: "12:00",
      diameterMm: 150,
      mirrored: false,
    });
    expect(
      diskTemplateQuerySchema.safeParse({ date: "2026-03-14", diameterMm: "5" }).error?.issues[0]?.message,
    ).toMatch(/at least 40 mm/);
    expect(diskTemplateQuerySchema.safeParse({ date: "14/03/2026" }).error?.issues[0]?.message).toMatch(
      /YYYY-MM-DD/,
    );
  });
});
