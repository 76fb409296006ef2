/**
 * Everything the tracer and the server read off a tracing: each spot's and
 * each group's heliographic position, the counts g, s and their hemispheric
 * split, areas, and the problems that stop a save. Used live in the tracer
 * and again on the server, so the stored numbers never come from the client.
 */

import type { SolarOrientation } from "@/lib/solar/ephemeris";
import { checkGroupClasses } from "@/lib/solar/classes";
import { wrapDegrees360 } from "@/lib/solar/angles";
import { diskToHeliographic, type HeliographicPosition } from "@/lib/solar/heliographic";
import type { TracingDocument } from "@/lib/validation/tracing";

import { measureEllipseArea } from "./area";
import { fitCircle } from "./circle-fit";
import { computeCentroid } from "./grouping";
import { documentToSky, resolveSkyFrame, type SkyFrame } from "./orientation";

export type MeasuredSpot = {
  id: string;
  groupId: string | null;
  /** Null when the disk is not fitted and oriented, or the spot is off the disk. */
  position: HeliographicPosition | null;
  outsideDisk: boolean;
  areaMsh: number | null;
};

export type MeasuredGroup = {
  id: string;
  number: number;
  zurichClass: string | null;
  mcintoshClass: string | null;
  spotIds: string[];
  spotCount: number;
  latitudeDeg: number;
  cmdDeg: number;
  carringtonLonDeg: number;
  hemisphere: "N" | "S";
  /** East–west span of the group's spots, degrees of heliographic longitude. */
  longitudinalExtentDeg: number;
  /** The group's ellipse if drawn, else the sum of its spots' ellipses, else null. */
  areaMsh: number | null;
};

export type TracingCounts = {
  groups: number;
  spots: number;
  northGroups: number;
  northSpots: number;
  southGroups: number;
  southSpots: number;
};

/** Counts as an observation stores them: the hemispheric split may be missing. */
export type ObservationCounts = {
  groups: number;
  spots: number;
  northGroups: number | null;
  northSpots: number | null;
  southGroups: number | null;
  southSpots: number | null;
};

export type TracingProblem = { path: string; message: string };

export type TracingMeasurement = {
  frame: SkyFrame | null;
  spots: MeasuredSpot[];
  groups: MeasuredGroup[];
  counts: TracingCounts;
  problems: TracingProblem[];
};

/** A disk may be off the fitted circle by this fraction of its radius (rounding, a hand-nudged disk). */
const LIMB_FIT_TOLERANCE = 0.01;

/** A disk said to be fitted to limb points must really be the circle through them. */
function checkLimbFit(disk: TracingDocument["disk"]): string | null {
  if (!disk || disk.method !== "limb-points") return null;
  const fit = fitCircle({ points: disk.limbPoints });
  if (!fit.ok) return fit.message;
  const { cx, cy, r } = fit.circle;
  if (
    Math.hypot(cx - disk.cx, cy - disk.cy) > LIMB_FIT_TOLERANCE * r ||
    Math.abs(r - disk.r) > LIMB_FIT_TOLERANCE * r
  ) {
    return "The disk does not match the circle through its limb points; fit the circle again.";
  }
  return null;
}

function describeSpot(index: number): string {
  return `Spot ${index + 1}`;
}

export function measureTracing({
  document,
  orientation,
}: {
  document: TracingDocument;
  orientation: SolarOrientation;
}): TracingMeasurement {
  const problems: TracingProblem[] = [];
  const limbProblem = checkLimbFit(document.disk);
  if (limbProblem) problems.push({ path: "disk", message: limbProblem });
  const resolved = resolveSkyFrame({ disk: document.disk, orientation: document.orientation });
  const frame = resolved.ok ? resolved.frame : null;
  if (!resolved.ok)
    problems.push({ path: document.disk ? "orientation" : "disk", message: resolved.message });

  const spots: MeasuredSpot[] = document.spots.map((spot, index) => {
    if (!frame)
      return { id: spot.id, groupId: spot.groupId, position: null, outsideDisk: false, areaMsh: null };
    const position = diskToHeliographic(documentToSky({ point: spot, frame }), orientation);
    if (!position) {
      problems.push({
        path: `spots.${index}`,
        message: `${describeSpot(index)} lies outside the disk. Move it onto the disk or delete it.`,
      });
    }
    let areaMsh: number | null = null;
    if (spot.area) {
      const area = measureEllipseArea({ ellipse: spot.area, frame, at: orientation });
      if (area.ok) areaMsh = area.areaMsh;
      else
        problems.push({
          path: `spots.${index}.area`,
          message: `${describeSpot(index)}'s area: ${area.message}`,
        });
    }
    return { id: spot.id, groupId: spot.groupId, position, outsideDisk: !position, areaMsh };
  });

  const ungrouped = document.spots.filter((s) => s.groupId === null).length;
  if (ungrouped > 0) {
    problems.push({
      path: "spots",
      message: `${ungrouped} ${ungrouped === 1 ? "spot is" : "spots are"} not in a group. Every spot belongs to a group: select ${ungrouped === 1 ? "it" : "them"} and group, or accept the suggested groups.`,
    });
  }

  const numbers = new Map<number, number>();
  for (const group of document.groups) numbers.set(group.number, (numbers.get(group.number) ?? 0) + 1);

  const groups: MeasuredGroup[] = [];
  document.groups.forEach((group, index) => {
    const members = spots.filter((s) => s.groupId === group.id);
    const path = `groups.${index}`;
    if (members.length === 0) {
      problems.push({ path, message: `Group ${group.number} has no spots; add spots to it or delete it.` });
      return;
    }
    if ((numbers.get(group.number) ?? 0) > 1) {
      problems.push({
        path: `${path}.number`,
        message: `Two groups are numbered ${group.number}; give each group its own number.`,
      });
    }
    for (const message of checkGroupClasses({
      zurichClass: group.zurichClass,
      mcintoshClass: group.mcintoshClass,
      spotCount: members.length,
    })) {
      problems.push({ path: `${path}.class`, message: `Group ${group.number}: ${message}` });
    }
    const placed = members.flatMap((m) => (m.position ? [m.position] : []));
    const centre = computeCentroid({ positions: placed });
    if (!frame || !centre) return;

    let areaMsh: number | null = null;
    if (group.area) {
      const area = measureEllipseArea({ ellipse: group.area, frame, at: orientation });
      if (area.ok) areaMsh = area.areaMsh;
      else problems.push({ path: `${path}.area`, message: `Group ${group.number}'s area: ${area.message}` });
    } else if (members.some((m) => m.areaMsh !== null)) {
      areaMsh = members.reduce((sum, m) => sum + (m.areaMsh ?? 0), 0);
    }
    const lons = placed.map((p) => p.lon);
    groups.push({
      id: group.id,
      number: group.number,
      zurichClass: group.zurichClass,
      mcintoshClass: group.mcintoshClass,
      spotIds: members.map((m) => m.id),
      spotCount: members.length,
      latitudeDeg: centre.lat,
      cmdDeg: centre.lon,
      carringtonLonDeg: wrapDegrees360(centre.lon + orientation.l0),
      // A group belongs to the hemisphere of its centre (PRODUCT.md); the equator counts as north.
      hemisphere: centre.lat >= 0 ? "N" : "S",
      longitudinalExtentDeg: Math.max(...lons) - Math.min(...lons),
      areaMsh,
    });
  });

  const counts: TracingCounts = {
    groups: 0,
    spots: 0,
    northGroups: 0,
    northSpots: 0,
    southGroups: 0,
    southSpots: 0,
  };
  for (const group of groups) {
    counts.groups += 1;
    counts.spots += group.spotCount;
    if (group.hemisphere === "N") {
      counts.northGroups += 1;
      counts.northSpots += group.spotCount;
    } else {
      counts.southGroups += 1;
      counts.southSpots += group.spotCount;
    }
  }
  return { frame, spots, groups: groups.sort((a, b) => a.number - b.number), counts, problems };
}
