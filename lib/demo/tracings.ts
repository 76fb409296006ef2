/**
 * Disk tracings for the demo network (invented, like everything in lib/demo):
 * two demo observers sketch their disk once a week, so the Archive's
 * latitude–time diagram and the observation pages have drawings to show.
 * Each drawing is built so that measuring it gives back exactly the day's
 * logged counts, north and south; the group latitudes follow a made-up drift
 * towards the equator over the demo period. Nothing here is a measurement.
 */
import { solarOrientation } from "@/lib/solar/ephemeris";
import { heliographicToDisk } from "@/lib/solar/heliographic";
import { measureTracing, type MeasuredGroup } from "@/lib/tracer/measure";
import { resolveSkyFrame, skyToDocument } from "@/lib/tracer/orientation";
import { createEmptyTracing, type TracingDocument, type TracingSpot } from "@/lib/validation/tracing";

import { makeRandom, type Random } from "./random";
import { DEMO_FIRST_DAY, DEMO_LAST_DAY, DEMO_SEED, type DemoObservation } from "./scenario";

/** Who traces, and on which weekday (0 = Sunday, UT). */
export const DEMO_TRACERS: Readonly<Record<string, number>> = { wren: 0, keiko: 3 };

export type DemoTracing = { document: TracingDocument; groups: MeasuredGroup[] };

const DISK = { cx: 500, cy: 500, r: 400, method: "drag" as const, limbPoints: [] };
// A horizontal drift line, left to right: the image drifts west, north is up.
const ORIENTATION = {
  mode: "drift" as const,
  from: { x: 100, y: 950 },
  to: { x: 700, y: 950 },
  mirrored: false,
};

/**
 * Invented mean distance of the groups from the equator: the demo period sits
 * across a made-up cycle maximum, so activity drifts from about 22° towards
 * 13° (the shape, not the numbers, of the usual equatorward drift).
 */
export function inventedMeanLatitudeDeg(day: string): number {
  const first = Date.parse(`${DEMO_FIRST_DAY}T00:00:00Z`);
  const span = Date.parse(`${DEMO_LAST_DAY}T00:00:00Z`) - first;
  const phase = Math.min(1, Math.max(0, (Date.parse(`${day}T00:00:00Z`) - first) / span));
  return 22 - 9 * phase;
}

/** Splits `spots` among `groups` groups, each keeping at least one. */
function shareSpots({ random, groups, spots }: { random: Random; groups: number; spots: number }): number[] {
  const shares = Array.from({ length: groups }, () => 1);
  for (let extra = spots - groups; extra > 0; extra--) {
    // Larger groups draw more of the remaining spots, as real ones do.
    const weights = shares.map((n) => n + 1);
    let pick = random.next() * weights.reduce((a, b) => a + b, 0);
    let i = 0;
    while (i < shares.length - 1 && pick >= weights[i]!) pick -= weights[i++]!;
    shares[i]! += 1;
  }
  return shares;
}

function gaussian(random: Random): number {
  const u = Math.max(random.next(), 1e-12);
  return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * random.next());
}

/**
 * The drawing of one demo count: its groups placed on the visible disk at
 * invented positions, with the count's spots shared among them. Null for a
 * count the drawing cannot match exactly (no hemispheric split, or a spot
 * that would land beyond the limb), which is then simply left untraced.
 */
export function buildDemoTracing({
  observation,
  random,
}: {
  observation: DemoObservation;
  random: Random;
}): DemoTracing | null {
  const { northGroups, northSpots, southGroups, southSpots } = observation;
  if (northGroups === null || northSpots === null || southGroups === null || southSpots === null) return null;
  const orientation = solarOrientation(observation.observedAt);
  const resolved = resolveSkyFrame({ disk: DISK, orientation: ORIENTATION });
  if (!resolved.ok) return null;
  const frame = resolved.frame;

  const document: TracingDocument = { ...createEmptyTracing(), disk: DISK, orientation: ORIENTATION };
  const meanLatitude = inventedMeanLatitudeDeg(observation.utDate);
  const hemispheres = [
    { sign: 1, shares: shareSpots({ random, groups: northGroups, spots: northSpots }) },
    { sign: -1, shares: shareSpots({ random, groups: southGroups, spots: southSpots }) },
  ];
  let number = 0;
  for (const { sign, shares } of hemispheres) {
    for (const spotCount of shares) {
      number += 1;
      const groupId = `g${number}`;
      // Centres stay well off the equator so the group keeps its hemisphere.
      const lat = sign * Math.min(40, Math.max(4, meanLatitude + 5 * gaussian(random)));
      const cmd = -65 + 130 * random.next();
      const spanDeg = 1 + 1.5 * Math.sqrt(spotCount);
      document.groups.push({ id: groupId, number, zurichClass: null, mcintoshClass: null, area: null });
      for (let i = 0; i < spotCount; i++) {
        const point = heliographicToDisk(
          { lat: lat + (random.next() - 0.5) * 2, lon: cmd + (random.next() - 0.5) * spanDeg },
          orientation,
        );
        if (!point) return null;
        const at = skyToDocument({ point, frame });
        const umbraRadius = Math.round((2 + 3 * random.next()) * 10) / 10;
        const spot: TracingSpot = {
          id: `s${document.spots.length + 1}`,
          x: Math.round(at.x * 100) / 100,
          y: Math.round(at.y * 100) / 100,
          umbraRadius,
          // The leading spot of a larger group gets a penumbra.
          penumbraRadius: i === 0 && spotCount >= 4 ? umbraRadius * 2 : null,
          groupId,
          area: null,
        };
        document.spots.push(spot);
      }
    }
  }

  const measured = measureTracing({ document, orientation });
  const { counts } = measured;
  const matches =
    measured.problems.length === 0 &&
    counts.groups === observation.groups &&
    counts.spots === observation.spots &&
    counts.northGroups === northGroups &&
    counts.northSpots === northSpots &&
    counts.southGroups === southGroups &&
    counts.southSpots === southSpots;
  return matches ? { document, groups: measured.groups } : null;
}

/**
 * The demo's tracings, keyed by the index of their observation in
 * `observations`. A random stream of its own keeps the demo's counts exactly
 * as they were without tracings.
 */
export function buildDemoTracings({
  observations,
  seed = DEMO_SEED + 1,
}: {
  observations: readonly DemoObservation[];
  seed?: number;
}): Map<number, DemoTracing> {
  const random = makeRandom(seed);
  const tracings = new Map<number, DemoTracing>();
  observations.forEach((observation, index) => {
    const weekday = DEMO_TRACERS[observation.observerKey];
    if (weekday === undefined) return;
    if (observation.observedAt.getUTCDay() !== weekday) return;
    const tracing = buildDemoTracing({ observation, random });
    if (tracing) tracings.set(index, tracing);
  });
  return tracings;
}
