/**
 * The printable disk template: a sheet at true size with the limb circle,
 * the heliographic grid for the day (turned by P, tilted by B0), the N–S and
 * E–W marks and boxes for the day's notes. Observers tape it to the
 * projection screen, turn it until a spot drifts along the E–W line with the
 * drive off, size the image to the circle, and draw.
 *
 * Plain string building (no DOM), so the API route and the print page share
 * it and tests can read the output.
 */

import type { SolarOrientation } from "@/lib/solar/ephemeris";
import { computeHeliographicGrid, type HeliographicGrid } from "@/lib/solar/grid";
import { projectHeliographicToDisk, type DiskPoint } from "@/lib/solar/heliographic";

export const DEFAULT_TEMPLATE_DIAMETER_MM = 150;
export const MIN_TEMPLATE_DIAMETER_MM = 40;
export const MAX_TEMPLATE_DIAMETER_MM = 400;

const A4 = { widthMm: 210, heightMm: 297 };
const SIDE_MARGIN_MM = 20;
const HEADER_MM = 30;
const MARKS_MM = 12;
const FIELDS_MM = 46;

export type DiskTemplateLayout = {
  widthMm: number;
  heightMm: number;
  cxMm: number;
  cyMm: number;
  radiusMm: number;
};

/** A4 when the disk fits, otherwise a sheet just large enough. */
export function layoutDiskTemplate({ diameterMm }: { diameterMm: number }): DiskTemplateLayout {
  const radiusMm = diameterMm / 2;
  const widthMm = Math.max(A4.widthMm, diameterMm + 2 * SIDE_MARGIN_MM);
  const heightMm = Math.max(A4.heightMm, HEADER_MM + 2 * MARKS_MM + diameterMm + FIELDS_MM);
  return { widthMm, heightMm, cxMm: widthMm / 2, cyMm: HEADER_MM + MARKS_MM + radiusMm, radiusMm };
}

function escapeXml(text: string): string {
  return text.replace(
    /[<>&"']/g,
    (c) => ({ "<": "&lt;", ">": "&gt;", "&": "&amp;", '"': "&quot;", "'": "&apos;" })[c]!,
  );
}

function fixed(value: number, digits = 2): string {
  return Number(value.toFixed(digits)).toString();
}

function signed(value: number, digits = 2): string {
  return `${value >= 0 ? "+" : "−"}${Math.abs(value).toFixed(digits)}`;
}

export type DiskTemplateInput = {
  /** The instant the grid is drawn for. */
  at: Date;
  orientation: SolarOrientation;
  diameterMm: number;
  /** Draw the disk mirror-reversed (west on the left), as a projection seen from the telescope's side shows it. */
  mirrored: boolean;
};

export function renderDiskTemplateSvg({ at, orientation, diameterMm, mirrored }: DiskTemplateInput): string {
  const layout = layoutDiskTemplate({ diameterMm });
  const { widthMm, heightMm, cxMm, cyMm, radiusMm } = layout;
  const grid = computeHeliographicGrid({ at: orientation });
  const westSign = mirrored ? -1 : 1;
  const toPage = (p: DiskPoint) => ({ x: cxMm + westSign * radiusMm * p.x, y: cyMm - radiusMm * p.y });
  const path = (points: DiskPoint[]) =>
    points
      .map((p, i) => {
        const q = toPage(p);
        return `${i === 0 ? "M" : "L"}${fixed(q.x, 3)} ${fixed(q.y, 3)}`;
      })
      .join("");
  const lines = (segments: DiskPoint[][]) => segments.map(path).join("");

  const dateText = at.toISOString().slice(0, 10);
  const timeText = at.toISOString().slice(11, 16);
  const gridLines = [
    ...grid.parallels.flatMap((l) => l.segments),
    ...grid.meridians.flatMap((l) => l.segments),
  ];
  const parts: string[] = [];

  parts.push(
    `<svg xmlns="http://www.w3.org/2000/svg" width="${fixed(widthMm)}mm" height="${fixed(heightMm)}mm" viewBox="0 0 ${fixed(widthMm)} ${fixed(heightMm)}" font-family="Inter, Helvetica, Arial, sans-serif" role="img" aria-label="Disk template for ${dateText}">`,
    `<title>Heliotally disk template, ${dateText}, ${fixed(diameterMm, 1)} mm</title>`,
    `<rect x="0" y="0" width="${fixed(widthMm)}" height="${fixed(heightMm)}" fill="#ffffff"/>`,
    // Header.
    `<text x="${SIDE_MARGIN_MM}" y="14" font-size="6" font-weight="600" fill="#17172a">Disk template · ${dateText}</text>`,
    `<text x="${SIDE_MARGIN_MM}" y="21" font-size="3.2" fill="#42435f">Grid for ${dateText} ${timeText} UT: P ${signed(orientation.p)}°, B0 ${signed(orientation.b0)}°, L0 ${fixed(orientation.l0)}°, Carrington rotation ${fixed(orientation.carringtonRotation, 2)}. Lines every 10°.</text>`,
    `<text x="${SIDE_MARGIN_MM}" y="26" font-size="3.2" fill="#42435f">Disk ${fixed(diameterMm, 1)} mm across. Celestial north up; ${mirrored ? "mirror-reversed: west on the left" : "as on the sky: west on the right"}. With the drive off the image drifts toward W.</text>`,
  );

  // Grid, equator, central meridian, limb.
  parts.push(
    `<g fill="none" stroke-linecap="round" stroke-linejoin="round">`,
    `<path d="${lines(gridLines)}" stroke="#8587a9" stroke-width="0.15"/>`,
    `<path d="${lines(grid.equator.segments)}" stroke="#b35309" stroke-width="0.35"/>`,
    `<path d="${lines(grid.centralMeridian.segments)}" stroke="#b35309" stroke-width="0.35"/>`,
    `<circle cx="${fixed(cxMm, 3)}" cy="${fixed(cyMm, 3)}" r="${fixed(radiusMm, 3)}" stroke="#17172a" stroke-width="0.5"/>`,
    `</g>`,
  );

  // Latitude labels along the central meridian, where they fall on the disk.
  const labelSize = Math.max(2, Math.min(3, radiusMm / 25));
  for (let lat = -60; lat <= 60; lat += 30) {
    const p = projectHeliographicToDisk({ lat, lon: 0 }, orientation);
    if (p.limbMargin < 0.05) continue;
    const q = toPage(p);
    parts.push(
      `<text x="${fixed(q.x + 0.8, 3)}" y="${fixed(q.y - 0.6, 3)}" font-size="${fixed(labelSize)}" fill="#8f420e">${lat === 0 ? "0°" : `${lat > 0 ? "+" : "−"}${Math.abs(lat)}°`}</text>`,
    );
  }

  // Poles.
  const poles: Array<[HeliographicGrid["northPole"], string]> = [
    [grid.northPole, "N pole"],
    [grid.southPole, "S pole"],
  ];
  for (const [pole, label] of poles) {
    if (!pole) continue;
    const q = toPage(pole);
    parts.push(
      `<circle cx="${fixed(q.x, 3)}" cy="${fixed(q.y, 3)}" r="0.8" fill="#b35309"/>`,
      `<text x="${fixed(q.x + 1.2, 3)}" y="${fixed(q.y + (label === "N pole" ? 3.4 : -1.4), 3)}" font-size="${fixed(labelSize)}" fill="#b35309">${label}</text>`,
    );
  }

  // N–S and E–W marks outside the limb, and the E–W (drift) line across the disk.
  const tick = 6;
  const west = cxMm + westSign * (radiusMm + 2);
  const east = cxMm - westSign * (radiusMm + 2);
  parts.push(
    `<g stroke="#17172a" stroke-width="0.3">`,
    `<line x1="${fixed(cxMm)}" y1="${fixed(cyMm - radiusMm - 2)}" x2="${fixed(cxMm)}" y2="${fixed(cyMm - radiusMm - 2 - tick)}"/>`,
    `<line x1="${fixed(cxMm)}" y1="${fixed(cyMm + radiusMm + 2)}" x2="${fixed(cxMm)}" y2="${fixed(cyMm + radiusMm + 2 + tick)}"/>`,
    `<line x1="${fixed(west)}" y1="${fixed(cyMm)}" x2="${fixed(west + westSign * tick)}" y2="${fixed(cyMm)}"/>`,
    `<line x1="${fixed(east)}" y1="${fixed(cyMm)}" x2="${fixed(east - westSign * tick)}" y2="${fixed(cyMm)}"/>`,
    `</g>`,
    `<line x1="${fixed(cxMm - radiusMm)}" y1="${fixed(cyMm)}" x2="${fixed(cxMm + radiusMm)}" y2="${fixed(cyMm)}" stroke="#42435f" stroke-width="0.15" stroke-dasharray="1.5 1.5"/>`,
    `<line x1="${fixed(cxMm)}" y1="${fixed(cyMm - radiusMm)}" x2="${fixed(cxMm)}" y2="${fixed(cyMm + radiusMm)}" stroke="#42435f" stroke-width="0.15" stroke-dasharray="1.5 1.5"/>`,
    `<g font-size="4.5" font-weight="600" fill="#17172a" text-anchor="middle">`,
    `<text x="${fixed(cxMm)}" y="${fixed(cyMm - radiusMm - 2 - tick - 1.5)}">N</text>`,
    `<text x="${fixed(cxMm)}" y="${fixed(cyMm + radiusMm + 2 + tick + 5)}">S</text>`,
    `<text x="${fixed(west + westSign * (tick + 3.5))}" y="${fixed(cyMm + 1.6)}">W</text>`,
    `<text x="${fixed(east - westSign * (tick + 3.5))}" y="${fixed(cyMm + 1.6)}">E</text>`,
    `</g>`,
  );

  // Boxes to fill in by hand.
  const top = cyMm + radiusMm + MARKS_MM + 6;
  const boxWidth = (widthMm - 2 * SIDE_MARGIN_MM - 4 * 3) / 5;
  const fields: Array<[string, string]> = [
    ["Date (UT)", dateText],
    ["Time (UT)", ""],
    ["Seeing (1–5)", ""],
    ["Groups g", ""],
    ["Spots s", ""],
  ];
  fields.forEach(([label, value], i) => {
    const x = SIDE_MARGIN_MM + i * (boxWidth + 3);
    parts.push(
      `<rect x="${fixed(x)}" y="${fixed(top)}" width="${fixed(boxWidth)}" height="14" rx="1" fill="none" stroke="#42435f" stroke-width="0.3"/>`,
      `<text x="${fixed(x + 1.5)}" y="${fixed(top + 4)}" font-size="2.8" fill="#505175">${escapeXml(label)}</text>`,
    );
    if (value)
      parts.push(
        `<text x="${fixed(x + 1.5)}" y="${fixed(top + 11)}" font-size="4" fill="#17172a">${escapeXml(value)}</text>`,
      );
  });
  parts.push(
    `<text x="${SIDE_MARGIN_MM}" y="${fixed(top + 21)}" font-size="2.8" fill="#86230f">Never look at the Sun directly or through any optics without a certified solar filter.</text>`,
    `<text x="${SIDE_MARGIN_MM}" y="${fixed(top + 25)}" font-size="2.8" fill="#86230f">Project only; keep reflected beams away from eyes and roads; supervise children.</text>`,
    `<text x="${SIDE_MARGIN_MM}" y="${fixed(top + 30)}" font-size="2.6" fill="#65678e">Made with Heliotally. Print at 100% (no "fit to page") so the circle is ${fixed(diameterMm, 1)} mm across.</text>`,
    `</svg>`,
  );
  return parts.join("\n");
}
