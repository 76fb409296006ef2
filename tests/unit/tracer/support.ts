import { solarOrientation } from "@/lib/solar/ephemeris";
import { heliographicToDisk } from "@/lib/solar/heliographic";
import { resolveSkyFrame, skyToDocument } from "@/lib/tracer/orientation";
import { createEmptyTracing, type TracingDocument, type TracingSpot } from "@/lib/validation/tracing";

export const TEST_INSTANT = new Date("2024-05-10T12:00:00Z");
export const TEST_SUN = solarOrientation(TEST_INSTANT);

/** An oriented tracing (disk r = 400 at the centre of 1000 × 1000, north up, not mirrored). */
export function makeOrientedTracing(): TracingDocument {
  return {
    ...createEmptyTracing(),
    disk: { cx: 500, cy: 500, r: 400, method: "drag", limbPoints: [] },
    orientation: { mode: "north", point: { x: 500, y: 40 }, mirrored: false },
  };
}

/** A spot drawn where the heliographic point (lat, CMD) appears on the tracing at TEST_INSTANT. */
export function spotAt({
  document,
  id,
  lat,
  lon,
  groupId = null,
}: {
  document: TracingDocument;
  id: string;
  lat: number;
  lon: number;
  groupId?: string | null;
}): TracingSpot {
  const result = resolveSkyFrame({ disk: document.disk, orientation: document.orientation });
  if (!result.ok) throw new Error(result.message);
  const onSky = heliographicToDisk({ lat, lon }, TEST_SUN);
  if (!onSky) throw new Error("point not visible");
  const p = skyToDocument({ point: onSky, frame: result.frame });
  return { id, x: p.x, y: p.y, umbraRadius: 4, penumbraRadius: null, groupId, area: null };
}
