/**
 * Automatic flags raised when an observation arrives, so the coordinator's
 * eye goes first to the counts most likely to be wrong. Pure logic: the
 * database step (db/queries/review-flags.ts) gathers the inputs.
 *
 * None of these flags rejects anything: they only point. A flagged count may
 * well be right (a new large group, a first sighting), and the coordinator
 * decides.
 */
import type { FlagReason } from "@/db/schema";
import { computeRawCount } from "@/lib/counts/relative-number";
import { computeRobustScale, flagOutlier, flagUnusualSpotsPerGroup } from "@/lib/counts/robust";

export const OUTLIER_THRESHOLD_SETTING = "review.outlierThreshold";
export const DEFAULT_OUTLIER_THRESHOLD = 3;

/**
 * Floor on the spread of the day's scaled values, in relative-number units.
 * On a quiet day most observers may report exactly the same count, the MAD
 * collapses to 0 and one extra group would otherwise read as "infinitely"
 * far off; ten units is one group in 10g + s, the smallest step that matters.
 */
export const NETWORK_MIN_SCALE = 10;

/** Fewest other counts that day before the network comparison means anything. */
export const NETWORK_MIN_VALUES = 3;

export type AutomaticFlag = { reason: FlagReason; detail: string };

export type CountWithHemispheres = {
  groups: number;
  spots: number;
  northGroups: number | null;
  northSpots: number | null;
  southGroups: number | null;
  southSpots: number | null;
};

const fmt = (value: number, digits = 1) => value.toFixed(digits);

/** The day's robust network value from the other counts' scaled values k(10g + s). */
export function computeDayNetworkValue({ values }: { values: ArrayLike<number> }) {
  if (values.length === 0) return null;
  const { median, scale, n } = computeRobustScale({ values, minScale: NETWORK_MIN_SCALE });
  return { median, scale, n };
}

/**
 * (a) The observer's scaled value far from the day's robust network value:
 * |value − median| > threshold × robust σ, where σ is the scaled MAD of the
 * day's *other* accepted or waiting counts (the candidate is left out so a
 * wild value cannot pull the median towards itself).
 */
export function checkFarFromNetwork({
  scaledValue,
  otherScaledValues,
  threshold = DEFAULT_OUTLIER_THRESHOLD,
}: {
  scaledValue: number;
  otherScaledValues: ArrayLike<number>;
  threshold?: number;
}): AutomaticFlag | null {
  const result = flagOutlier({
    value: scaledValue,
    dayValues: otherScaledValues,
    threshold,
    minValues: NETWORK_MIN_VALUES,
    minScale: NETWORK_MIN_SCALE,
  });
  if (!result.isOutlier || result.robustZ === null || result.median === null || result.scale === null)
    return null;
  const side = result.robustZ > 0 ? "above" : "below";
  return {
    reason: "far-from-network",
    detail:
      `Scaled value ${fmt(scaledValue)} is ${fmt(Math.abs(result.robustZ))} robust σ ${side} the day's network median of ` +
      `${fmt(result.median)} (σ ${fmt(result.scale)} from ${result.n} other counts; threshold ${threshold}).`,
  };
}

/**
 * (b) Hemisphere counts that do not add up to the totals. The input schema
 * refuses these, but imported and older rows never went through it.
 */
export function checkHemispheres(count: CountWithHemispheres): AutomaticFlag | null {
  const split = [count.northGroups, count.northSpots, count.southGroups, count.southSpots];
  const given = split.filter((v) => v !== null).length;
  if (given === 0) return null;
  if (given < 4) {
    return {
      reason: "hemispheres-inconsistent",
      detail: `Only ${given} of the four hemisphere counts are given.`,
    };
  }
  const [nG, nS, sG, sS] = split as [number, number, number, number];
  const problems: string[] = [];
  if (nG + sG !== count.groups)
    problems.push(`north + south groups ${nG} + ${sG} = ${nG + sG}, but the total is ${count.groups}`);
  if (nS + sS !== count.spots)
    problems.push(`north + south spots ${nS} + ${sS} = ${nS + sS}, but the total is ${count.spots}`);
  for (const [label, g, s] of [
    ["north", nG, nS],
    ["south", sG, sS],
  ] as const) {
    if (g === 0 && s > 0) problems.push(`${s} ${label}ern spots but no ${label}ern groups`);
    else if (s < g) problems.push(`fewer ${label}ern spots (${s}) than groups (${g})`);
  }
  if (problems.length === 0) return null;
  const text = problems.join("; ");
  return { reason: "hemispheres-inconsistent", detail: `${text.charAt(0).toUpperCase()}${text.slice(1)}.` };
}

/**
 * (c) An s/g ratio unusual for this observer, judged against their own
 * accepted history (ideally with the same instrument), so a telescope that
 * resolves many spots per group is not compared with a pinhole box.
 *
 * flagUnusualSpotsPerGroup measures the spread of ln(s/g) over the history,
 * which is dominated by busy days with many groups. A day with few spots has
 * more counting noise than that: with g fixed and the s − g extra spots
 * roughly Poisson, var(ln s) ≈ (s − g)/s². So a flag from the history alone
 * is kept only if the deviation also stands out against both spreads
 * combined; otherwise every one-group day of a telescope observer would be
 * flagged for having "too few" spots.
 */
export function checkSpotsPerGroup({
  groups,
  spots,
  history,
  threshold = DEFAULT_OUTLIER_THRESHOLD,
}: {
  groups: number;
  spots: number;
  history: ReadonlyArray<{ groups: number; spots: number }>;
  threshold?: number;
}): AutomaticFlag | null {
  const result = flagUnusualSpotsPerGroup({ groups, spots, history, threshold });
  if (!result.isUnusual) return null;
  if (result.reason === "spots-without-groups") {
    return {
      reason: "unusual-spots-per-group",
      detail: `${spots} spots but no groups: every spot belongs to a group.`,
    };
  }
  if (result.reason === "fewer-spots-than-groups") {
    return {
      reason: "unusual-spots-per-group",
      detail: `${spots} spots for ${groups} groups: every group has at least one spot.`,
    };
  }
  const typical = result.typicalSpotsPerGroup;
  const ratio = result.spotsPerGroup;
  const historyZ = result.robustZ;
  if (typical === null || ratio === null || historyZ === null) return null;
  const deviation = Math.log(ratio) - Math.log(typical);
  const historyScale = Number.isFinite(historyZ) && historyZ !== 0 ? Math.abs(deviation / historyZ) : 0;
  const countingVariance = (spots - groups) / (spots * spots);
  const combinedScale = Math.sqrt(historyScale ** 2 + countingVariance);
  const z = combinedScale > 0 ? deviation / combinedScale : Math.sign(deviation) * Number.POSITIVE_INFINITY;
  if (Math.abs(z) <= threshold) return null;
  return {
    reason: "unusual-spots-per-group",
    detail:
      `s/g = ${fmt(ratio)} against a usual ${fmt(typical)} for this observer ` +
      `(${Number.isFinite(z) ? fmt(Math.abs(z)) : "many"} σ ${z > 0 ? "above" : "below"}, counting noise included, over ${result.historyDays} accepted days).`,
  };
}

/**
 * (d) Another count by the same observer with the same instrument on the same
 * UT day: the network takes one count per observer and instrument per day,
 * so one of them is a duplicate or was logged against the wrong date.
 */
export function checkSecondOfDay({
  utDate,
  siblings,
}: {
  utDate: string;
  /** The observer's other non-rejected counts with this instrument on this UT day. */
  siblings: ReadonlyArray<{ observedAt: Date }>;
}): AutomaticFlag | null {
  if (siblings.length === 0) return null;
  const times = siblings
    .map((s) => s.observedAt.toISOString().slice(11, 16))
    .sort()
    .join(", ");
  const others = siblings.length === 1 ? "another count" : `${siblings.length} other counts`;
  return {
    reason: "second-of-the-day",
    detail: `This observer logged ${others} with the same instrument on ${utDate} (at ${times} UT).`,
  };
}

export type FlagInputs = CountWithHemispheres & {
  utDate: string;
  /** The observer's current k for the instrument used. */
  k: number;
  /** Scaled values k(10g + s) of the day's other accepted or waiting counts. */
  otherScaledValues: ArrayLike<number>;
  /** The observer's earlier accepted counts with this instrument. */
  history: ReadonlyArray<{ groups: number; spots: number }>;
  siblings: ReadonlyArray<{ observedAt: Date }>;
  /** Robust-σ threshold for the network comparison (the "review.outlierThreshold" setting). */
  threshold?: number;
};

/** Every automatic flag for one observation, in a stable order. */
export function computeAutomaticFlags(inputs: FlagInputs): AutomaticFlag[] {
  const threshold = inputs.threshold ?? DEFAULT_OUTLIER_THRESHOLD;
  // Legacy rows may carry impossible pairs; computeRawCount only refuses
  // negative or fractional numbers, which no stored row can hold.
  const scaledValue = inputs.k * computeRawCount({ groups: inputs.groups, spots: inputs.spots });
  const flags = [
    checkFarFromNetwork({ scaledValue, otherScaledValues: inputs.otherScaledValues, threshold }),
    checkHemispheres(inputs),
    // The setting governs the network comparison only; the s/g check keeps
    // its own fixed threshold so tuning one does not silently move the other.
    checkSpotsPerGroup({ groups: inputs.groups, spots: inputs.spots, history: inputs.history }),
    checkSecondOfDay({ utDate: inputs.utDate, siblings: inputs.siblings }),
  ];
  return flags.filter((f): f is AutomaticFlag => f !== null);
}
