/**
 * Hands what the observer accepted on a photo to the Disk tracer: the photo
 * as the tracing's background, the accepted limb as its disk and each
 * accepted spot as a spot (ungrouped: grouping stays the observer's call in
 * the tracer). The drawing area is the photo's own pixel grid, so positions
 * carry over unchanged.
 */
import { createEmptyTracing, type TracingDocument } from "@/lib/validation/tracing";

export type AcceptedLimb = { centreXPx: number; centreYPx: number; radiusPx: number };
export type AcceptedSpot = { id: string; xPx: number; yPx: number; radiusPx: number; hasUmbra: boolean };
export type PhotoLook = { brightness: number; contrast: number };

/** Spots per tracing are capped by the tracing format; the largest are kept first by the caller's order. */
export function buildTracingFromPhoto({
  photo,
  limb,
  spots,
  look,
  base,
}: {
  photo: { id: string | null; imageUrl: string | null; widthPx: number; heightPx: number };
  limb: AcceptedLimb | null;
  spots: AcceptedSpot[];
  look: PhotoLook;
  /** An existing tracing to add to (its own spots and groups are kept). */
  base?: TracingDocument | null;
}): TracingDocument {
  const width = clampInt(photo.widthPx, 100, 20_000);
  const height = clampInt(photo.heightPx, 100, 20_000);
  const doc = base ?? createEmptyTracing({ width, height });
  // Positions are in photo pixels; scale them if an existing drawing area has another size.
  const sx = doc.canvas.width / Math.max(1, photo.widthPx);
  const sy = doc.canvas.height / Math.max(1, photo.heightPx);
  const s = (sx + sy) / 2;
  const taken = new Set(doc.spots.map((spot) => spot.id));
  const newSpots = spots.map((spot, index) => {
    let id = `photo-${index + 1}`;
    for (let n = index + 1; taken.has(id); n += spots.length) id = `photo-${n + spots.length}`;
    taken.add(id);
    return {
      id,
      x: spot.xPx * sx,
      y: spot.yPx * sy,
      // The candidate's size is its whole dark area; an umbra is taken as about half its radius (common practice).
      umbraRadius: Math.max(0.5, spot.radiusPx * s * (spot.hasUmbra ? 0.5 : 0.9)),
      penumbraRadius: spot.hasUmbra ? Math.max(0.6, spot.radiusPx * s) : null,
      groupId: null,
      area: null,
    };
  });
  return {
    ...doc,
    background: {
      imageUrl: photo.imageUrl,
      photoId: photo.id,
      brightness: clamp(look.brightness, 0, 4),
      contrast: clamp(look.contrast, -100, 100),
    },
    disk: limb
      ? {
          cx: limb.centreXPx * sx,
          cy: limb.centreYPx * sy,
          r: limb.radiusPx * s,
          method: "limb-points",
          limbPoints: pointsOnCircle({
            cx: limb.centreXPx * sx,
            cy: limb.centreYPx * sy,
            r: limb.radiusPx * s,
            count: 12,
          }),
        }
      : doc.disk,
    spots: [...doc.spots, ...newSpots],
  };
}

function pointsOnCircle({ cx, cy, r, count }: { cx: number; cy: number; r: number; count: number }) {
  return Array.from({ length: count }, (_, k) => {
    const angle = (2 * Math.PI * k) / count;
    return { x: cx + r * Math.cos(angle), y: cy + r * Math.sin(angle) };
  });
}

const clamp = (v: number, lo: number, hi: number) => Math.min(hi, Math.max(lo, v));
const clampInt = (v: number, lo: number, hi: number) => Math.round(clamp(v, lo, hi));
