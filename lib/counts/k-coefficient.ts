/**
 * Personal reduction coefficient k: the factor that brings an observer's raw
 * count 10g + s onto the scale of a reference series, k ≈ reference / raw,
 * found over common days (A. H. Shapley 1949, "Reduction of sunspot-number
 * observations", PASP 61, 13). The reference is either an imported series
 * ({@link estimateK}) or the network itself, iterated with a pilot observer
 * held fixed ({@link estimateNetworkK}).
 */

import { lendFloat64, lendInt32 } from "./scratch";
import { computeMedianInPlace, computeRobustScale } from "./robust";
import { assignDaySlots, formatDayNumber, toDayNumber } from "./series";

export type KMethod = "ratio-of-sums" | "mean-of-ratios" | "median-of-ratios";
export const K_METHODS: readonly KMethod[] = ["ratio-of-sums", "mean-of-ratios", "median-of-ratios"];

/**
 * Fewest common days we accept a k from. Below about 20 days one unusual
 * day (a missed group, a bad-seeing count) moves k by several per cent.
 */
export const DEFAULT_MIN_COMMON_DAYS = 20;

export type KPair = { reference: number; raw: number };

/**
 * A fitted k. `k` is null only when no day was usable (n = 0), so
 * `estimate.k !== null` narrows to a number. `sigma` is null with fewer than
 * two days, where no spread can be measured. `meetsMinimum` tells the caller
 * whether n reached the minimum number of common days; the value is still
 * returned below it so a screen can show "k ≈ 0.83 (only 12 days)".
 */
export type KEstimate =
  | { k: number; n: number; sigma: number | null; method: KMethod; meetsMinimum: boolean }
  | { k: null; n: 0; sigma: null; method: KMethod; meetsMinimum: false };

/** Whether a fit rests on enough common days to be used. */
export function hasEnoughCommonDays({
  n,
  minCommonDays = DEFAULT_MIN_COMMON_DAYS,
}: {
  n: number;
  minCommonDays?: number;
}): boolean {
  return n >= Math.max(1, minCommonDays);
}

// ---------------------------------------------------------------------------
// Fit against a given reference
// ---------------------------------------------------------------------------

/**
 * k of one observer against a reference series, by one of three estimators.
 * Days where either the reference or the raw count is 0 are left out by all
 * three: a spotless day says nothing about scale, and a ratio with 0 is
 * undefined or infinite. Negative or non-finite values throw, because they
 * can only come from a bug upstream.
 *
 * - ratio-of-sums: k = Σref / Σraw. Weights busy days more, which is right
 *   when counting noise grows roughly like the count. sigma is the classical
 *   standard error of a ratio estimator from the residuals e = ref − k·raw:
 *   sigma = √(n/(n−1) · Σe²) / Σraw (W. G. Cochran, "Sampling Techniques",
 *   3rd ed. 1977, ch. 6). It does not assume how the noise scales with the
 *   count, so it stays honest when that assumption is wrong.
 * - mean-of-ratios: k = mean(ref/raw); sigma = sample SD of the ratios / √n,
 *   the standard error of a mean. Quiet days with raw 11 or 12 weigh as much
 *   as busy ones, and the ratio of noisy counts is biased upward by roughly
 *   var(raw)/raw², so this is the least robust of the three.
 * - median-of-ratios: k = median(ref/raw); sigma = 1.2533 · σ̂ / √n, the
 *   large-sample standard error of a median for normal data (√(π/2) = 1.2533),
 *   with σ̂ the scaled MAD of the ratios (mean absolute deviation if the MAD
 *   is 0) so that the outliers the median ignores do not inflate its sigma.
 *
 * sigma treats the reference as exact; reference noise adds to the real
 * uncertainty.
 */
export function estimateK(
  pairs: ReadonlyArray<KPair>,
  method: KMethod = "ratio-of-sums",
  { minCommonDays = DEFAULT_MIN_COMMON_DAYS }: { minCommonDays?: number } = {},
): KEstimate {
  const references = new Float64Array(pairs.length);
  const raws = new Float64Array(pairs.length);
  let n = 0;
  for (const { reference, raw } of pairs) {
    if (!Number.isFinite(reference) || !Number.isFinite(raw) || reference < 0 || raw < 0) {
      throw new RangeError(
        `estimateK: reference and raw must be finite and >= 0, got ${reference} and ${raw}`,
      );
    }
    if (reference === 0 || raw === 0) continue;
    references[n] = reference;
    raws[n] = raw;
    n++;
  }
  return fitK({ references, raws, n, method, minCommonDays, scratch: new Float64Array(n) });
}

/** The three estimators on the first n entries of typed arrays (all values already > 0). */
function fitK({
  references,
  raws,
  n,
  method,
  minCommonDays,
  scratch,
}: {
  references: Float64Array;
  raws: Float64Array;
  n: number;
  method: KMethod;
  minCommonDays: number;
  scratch: Float64Array;
}): KEstimate {
  if (n === 0) return { k: null, n: 0, sigma: null, method, meetsMinimum: false };
  const meetsMinimum = hasEnoughCommonDays({ n, minCommonDays });
  let k: number;
  let sigma: number | null = null;
  if (method === "ratio-of-sums") {
    let sumReference = 0;
    let sumRaw = 0;
    for (let i = 0; i < n; i++) {
      sumReference += references[i] as number;
      sumRaw += raws[i] as number;
    }
    k = sumReference / sumRaw;
    if (n >= 2) {
      let sumSquaredResiduals = 0;
      for (let i = 0; i < n; i++) {
        const residual = (references[i] as number) - k * (raws[i] as number);
        sumSquaredResiduals += residual * residual;
      }
      sigma = Math.sqrt((n / (n - 1)) * sumSquaredResiduals) / sumRaw;
    }
  } else if (method === "mean-of-ratios") {
    let sum = 0;
    for (let i = 0; i < n; i++) sum += (references[i] as number) / (raws[i] as number);
    k = sum / n;
    if (n >= 2) {
      let sumSquares = 0;
      for (let i = 0; i < n; i++) {
        const deviation = (references[i] as number) / (raws[i] as number) - k;
        sumSquares += deviation * deviation;
      }
      sigma = Math.sqrt(sumSquares / (n - 1) / n);
    }
  } else {
    for (let i = 0; i < n; i++) scratch[i] = (references[i] as number) / (raws[i] as number);
    const ratios = scratch.subarray(0, n);
    if (n >= 2) sigma = (1.2533 * computeRobustScale({ values: ratios }).scale) / Math.sqrt(n);
    k = computeMedianInPlace(ratios, n);
  }
  return { k, n, sigma, method, meetsMinimum };
}

// ---------------------------------------------------------------------------
// Drift
// ---------------------------------------------------------------------------

export type KDrift = {
  /** |current/previous − 1| > maxFraction. */
  isDrift: boolean;
  /** current/previous − 1; null when either k is missing. */
  relativeChange: number | null;
  /** Change in units of the combined sigma; null when either sigma is missing or both are 0. */
  zScore: number | null;
};

/**
 * Compares a newly fitted k with the one in use. A change larger than
 * `maxFraction` (default 10%) usually means a new instrument, a new site or
 * a changed counting habit, and should be confirmed before the new k is
 * published. The z-score tells whether the change is larger than the two
 * fits' own uncertainty; a large change with a small z is noise from few
 * days, not a drift in the observer.
 */
export function detectKDrift({
  previous,
  current,
  maxFraction = 0.1,
}: {
  previous: { k: number | null; sigma?: number | null };
  current: { k: number | null; sigma?: number | null };
  maxFraction?: number;
}): KDrift {
  if (previous.k === null || current.k === null || !(previous.k > 0)) {
    return { isDrift: false, relativeChange: null, zScore: null };
  }
  const relativeChange = current.k / previous.k - 1;
  const combinedSigma =
    previous.sigma != null && current.sigma != null ? Math.hypot(previous.sigma, current.sigma) : Number.NaN;
  return {
    isDrift: Math.abs(relativeChange) > maxFraction,
    relativeChange,
    zScore: combinedSigma > 0 ? (current.k - previous.k) / combinedSigma : null,
  };
}

// ---------------------------------------------------------------------------
// Network k: the network is its own reference
// ---------------------------------------------------------------------------

/** One count per observer per day; `day` is "YYYY-MM-DD" or a day number (see toDayNumber). */
export type NetworkObservation = { observerId: string; day: string | number; raw: number };

/**
 * - pilot: k held at the given value (sigma 0: it is a definition); n is
 *   its number of common days with the network.
 * - network: part of the network index; k fitted against it.
 * - below-minimum: fewer common days than the minimum; fitted against the
 *   final network but kept out of it so a poorly known k cannot shape others.
 * - unlinked: shares no chain of common days with the pilot, so its scale is
 *   undefined; k is null and it is kept out of the network.
 */
export type NetworkKStatus = "pilot" | "network" | "below-minimum" | "unlinked";
export type NetworkKEstimate = KEstimate & { status: NetworkKStatus };

export type NetworkKResult = {
  byObserver: Map<string, NetworkKEstimate>;
  iterations: number;
  converged: boolean;
  /** Largest relative change of any k in the last iteration. */
  maxRelativeChange: number;
  /** The pilot's own k measured against the final network; near pilotK when the network is self-consistent. */
  pilotAgainstNetwork: KEstimate;
};

/**
 * Fits every observer's k against the network's own daily index, with one
 * pilot observer's k held fixed to set the scale.
 *
 * Start from k = 1, build each day's index (mean of k_i·raw_i over the day's
 * network observers), refit each k against it, repeat until the largest
 * relative change is below `tolerance` or `maxIterations` is reached.
 *
 * Own value left out (leaveOwnOut, default true): observer i is fitted
 * against the mean of the *other* network observers that day. Kept in, a
 * share 1/n_d of each reference is the observer's own k·raw, whose ratio to
 * raw is exactly the current k whatever was counted; at the fixed point that
 * share drops out and what remains is the leave-out fit with each day
 * weighted by (n_d − 1)/n_d (exactly for the two linear methods,
 * approximately for the median). So keeping it in is not biased, but it
 * silently halves the weight of two-observer days and drags each step
 * towards the previous k; we leave it out because a reference should be
 * independent of what it calibrates. Days with a single network observer
 * carry no comparison either way and are skipped.
 *
 * How the pilot is held fixed: every observer, the pilot included, is
 * refitted against the index, and then all k values are multiplied by
 * pilotK / (the pilot's fitted k), so the pilot's k never changes and the
 * network's scale is, by definition, the pilot's. The alternative, simply
 * not refitting the pilot, ties everyone else's scale to the pilot only
 * through its 1/n_d share of each day's index. We tried it on the synthetic
 * networks of our tests: (1) it crawls: 852 iterations for 150 observers,
 * stopping (change < 1e-6) while still 1.4e-4 away from the answer; this
 * version needs under 30; (2) any bias of the estimator compounds about
 * (n_d − 1)-fold, because each observer's bias inflates the index the others
 * are fitted to. Mean of ratios is biased upward by about var(raw)/raw²
 * (1–3% at ordinary activity with Poisson-like counts); in a 12-observer
 * network that made every k about 28% too high, against about 1% here.
 * The price: an observer's fit against the published index equals its k
 * times pilotAgainstNetwork.k / pilotK, a factor within the pilot's own
 * uncertainty of 1 when the estimator is unbiased (ratio of sums).
 *
 * Observers with fewer than `minCommonDays` common days are fitted against
 * the final index but do not shape it; observers with no chain of common
 * days to the pilot get k = null. Throws if the pilot itself falls short.
 */
export function estimateNetworkK({
  observations,
  pilotId,
  ...options
}: {
  observations: ReadonlyArray<NetworkObservation>;
  pilotId: string;
} & NetworkKOptions): NetworkKResult {
  return fitNetwork({ layout: buildLayout(observations), pilotId, ...options });
}

export type NetworkKOptions = {
  pilotK?: number;
  method?: KMethod;
  tolerance?: number;
  maxIterations?: number;
  leaveOwnOut?: boolean;
  minCommonDays?: number;
};

/**
 * Counts as parallel columns: observation j is observer `observer[j]`
 * (an index into `observerIds`) on day number `day[j]` with `raw[j]`.
 */
export type NetworkColumns = {
  observerIds: readonly string[];
  observer: Int32Array;
  day: Int32Array;
  raw: Float64Array;
  length: number;
};

/**
 * {@link estimateNetworkK} over columns instead of one object per count:
 * the full recompute fits a million counts, where building those objects
 * and mapping their ids costs more than the fit itself (measured in
 * tests/bench/series.bench.ts). Same rules, same result.
 */
export function estimateNetworkKFromColumns({
  columns,
  pilotId,
  ...options
}: { columns: NetworkColumns; pilotId: string } & NetworkKOptions): NetworkKResult {
  const { observerIds, observer, day, raw, length } = columns;
  const observerIndex = new Map(observerIds.map((id, i) => [id, i]));
  if (observerIndex.size !== observerIds.length)
    throw new RangeError("estimateNetworkK: observer ids repeat");
  // layoutColumns checks every count's raw value, observer and day.
  const layout = layoutColumns({
    observerIds: [...observerIds],
    observerIndex,
    observerOf: observer.subarray(0, length),
    dayNumbers: day.subarray(0, length),
    raws: raw.subarray(0, length),
  });
  return fitNetwork({ layout, pilotId, ...options });
}

function fitNetwork({
  layout,
  pilotId,
  pilotK = 1,
  method = "ratio-of-sums",
  tolerance = 1e-6,
  maxIterations = 200,
  leaveOwnOut = true,
  minCommonDays = DEFAULT_MIN_COMMON_DAYS,
}: { layout: Layout; pilotId: string } & NetworkKOptions): NetworkKResult {
  if (!(pilotK > 0) || !Number.isFinite(pilotK))
    throw new RangeError(`pilotK must be positive, got ${pilotK}`);
  const pilot = layout.observerIndex.get(pilotId);
  if (pilot === undefined || layout.offsets[pilot] === layout.offsets[pilot + 1])
    throw new RangeError(`The pilot "${pilotId}" has no observations`);

  const inNetwork = selectNetworkObservers({ layout, minCommonDays });
  if (inNetwork[pilot] !== 1) {
    throw new RangeError(
      `The pilot "${pilotId}" has fewer than ${minCommonDays} days in common with the network`,
    );
  }
  const linked = markLinkedToPilot({ layout, inNetwork, pilot });
  const statuses: NetworkKStatus[] = [];
  for (let i = 0; i < layout.observerCount; i++) {
    statuses.push(
      i === pilot ? "pilot" : inNetwork[i] !== 1 ? "below-minimum" : linked[i] === 1 ? "network" : "unlinked",
    );
    if (linked[i] !== 1) inNetwork[i] = 0;
  }

  const { observerCount, offsets, slots, raws, slotCount } = layout;
  const dayCount = new Float64Array(slotCount);
  const positiveCount = new Float64Array(slotCount);
  for (let i = 0; i < observerCount; i++) {
    if (inNetwork[i] !== 1) continue;
    for (let j = offsets[i] as number; j < (offsets[i + 1] as number); j++) {
      const slot = slots[j] as number;
      dayCount[slot] = (dayCount[slot] as number) + 1;
      if ((raws[j] as number) > 0) positiveCount[slot] = (positiveCount[slot] as number) + 1;
    }
  }

  const k = new Float64Array(observerCount).fill(1);
  k[pilot] = pilotK;
  const fitted = new Float64Array(observerCount);
  const step =
    method === "ratio-of-sums"
      ? prepareRatioOfSumsStep({ layout, inNetwork, dayCount, positiveCount, leaveOwnOut })
      : prepareRatiosStep({ layout, inNetwork, dayCount, positiveCount, leaveOwnOut, method });

  let iterations = 0;
  let converged = false;
  let maxRelativeChange = Number.POSITIVE_INFINITY;
  while (iterations < maxIterations) {
    iterations++;
    step(k, fitted);
    // Hold the pilot fixed by rescaling everyone: the pilot's fitted value
    // against this index defines what "k = pilotK" means.
    const scale = pilotK / (fitted[pilot] as number);
    maxRelativeChange = 0;
    for (let i = 0; i < observerCount; i++) {
      if (inNetwork[i] !== 1 || i === pilot) continue;
      const next = (fitted[i] as number) * scale;
      const change = Math.abs(next / (k[i] as number) - 1);
      if (change > maxRelativeChange) maxRelativeChange = change;
      k[i] = next;
    }
    if (maxRelativeChange < tolerance) {
      converged = true;
      break;
    }
  }

  return summariseNetwork({
    layout,
    k,
    inNetwork,
    dayCount,
    positiveCount,
    statuses,
    pilot,
    pilotK,
    method,
    leaveOwnOut,
    minCommonDays,
    iterations,
    converged,
    maxRelativeChange,
  });
}

/** One refit of every network observer's k against the index the current k values build. */
type NetworkStep = (k: Float64Array, fitted: Float64Array) => void;

type StepInput = {
  layout: Layout;
  inNetwork: Uint8Array;
  dayCount: Float64Array;
  positiveCount: Float64Array;
  leaveOwnOut: boolean;
};

/**
 * Mean or median of ratios: each usable day's reference,
 * (daySum − own k·raw) / (others), is formed anew in every iteration.
 */
function prepareRatiosStep({
  layout,
  inNetwork,
  dayCount,
  positiveCount,
  leaveOwnOut,
  method,
}: StepInput & { method: "mean-of-ratios" | "median-of-ratios" }): NetworkStep {
  const { observerCount, offsets, slots, raws, slotCount } = layout;
  const daySum = new Float64Array(slotCount);
  const scratch = new Float64Array(layout.maxObservationsPerObserver);
  return (k, fitted) => {
    daySum.fill(0);
    for (let i = 0; i < observerCount; i++) {
      if (inNetwork[i] !== 1) continue;
      const ki = k[i] as number;
      for (let j = offsets[i] as number; j < (offsets[i + 1] as number); j++) {
        const slot = slots[j] as number;
        daySum[slot] = (daySum[slot] as number) + ki * (raws[j] as number);
      }
    }
    for (let i = 0; i < observerCount; i++) {
      if (inNetwork[i] !== 1) continue;
      const ownShare = leaveOwnOut ? (k[i] as number) : 0;
      let sumRatio = 0;
      let used = 0;
      for (let j = offsets[i] as number; j < (offsets[i + 1] as number); j++) {
        const raw = raws[j] as number;
        const slot = slots[j] as number;
        // A usable day needs the observer's own count and at least one other
        // network observer with spots (otherwise the reference is 0).
        if (!(raw > 0) || (positiveCount[slot] as number) < 2) continue;
        const divisor = (dayCount[slot] as number) - (leaveOwnOut ? 1 : 0);
        const ratio = ((daySum[slot] as number) - ownShare * raw) / divisor / raw;
        if (method === "mean-of-ratios") sumRatio += ratio;
        else scratch[used] = ratio;
        used++;
      }
      fitted[i] = method === "mean-of-ratios" ? sumRatio / used : computeMedianInPlace(scratch, used);
    }
  };
}

/**
 * Ratio of sums, the default, rearranged so an iteration costs two light
 * passes. With w_d = 1 / (the day's other network observers) and D_i
 * observer i's usable days (own count with spots, and another network
 * observer with spots),
 *   Σ_{d∈D_i} reference_d = Σ_{d∈D_i} w_d·daySum_d − k_i·Σ_{d∈D_i} w_d·raw_id,
 * where the second sum, like Σ_{d∈D_i} raw_id, stays the same in every
 * iteration. So an iteration only adds up each day's sum (from the counts
 * with spots) and then, per observer, w_d·daySum_d over its usable days:
 * no division and no test per count.
 */
function prepareRatioOfSumsStep({
  layout,
  inNetwork,
  dayCount,
  positiveCount,
  leaveOwnOut,
}: StepInput): NetworkStep {
  const { observerCount, offsets, slots, raws, slotCount } = layout;
  const weight = new Float64Array(slotCount);
  for (let slot = 0; slot < slotCount; slot++) {
    const others = (dayCount[slot] as number) - (leaveOwnOut ? 1 : 0);
    weight[slot] = others > 0 ? 1 / others : 0;
  }
  // Compacted once: the network's counts with spots (the only ones adding
  // to a day's sum), and each observer's usable days.
  let positives = 0;
  for (let slot = 0; slot < slotCount; slot++) positives += positiveCount[slot] as number;
  // Lent (./scratch.ts): only the positions written below are read.
  const positiveSlots = lendInt32("ratio-of-sums:positive-slots", positives);
  const positiveRaws = lendFloat64("ratio-of-sums:positive-raws", positives);
  const positiveOffsets = new Int32Array(observerCount + 1);
  const usableSlots = lendInt32("ratio-of-sums:usable-slots", positives);
  const usableOffsets = new Int32Array(observerCount + 1);
  const sumRaw = new Float64Array(observerCount);
  const sumWeightedRaw = new Float64Array(observerCount);
  let p = 0;
  let u = 0;
  for (let i = 0; i < observerCount; i++) {
    positiveOffsets[i] = p;
    usableOffsets[i] = u;
    if (inNetwork[i] !== 1) continue;
    let raw = 0;
    let weighted = 0;
    for (let j = offsets[i] as number; j < (offsets[i + 1] as number); j++) {
      const value = raws[j] as number;
      if (!(value > 0)) continue;
      const slot = slots[j] as number;
      positiveSlots[p] = slot;
      positiveRaws[p++] = value;
      if ((positiveCount[slot] as number) < 2) continue;
      usableSlots[u++] = slot;
      raw += value;
      weighted += value * (weight[slot] as number);
    }
    sumRaw[i] = raw;
    sumWeightedRaw[i] = leaveOwnOut ? weighted : 0;
  }
  positiveOffsets[observerCount] = p;
  usableOffsets[observerCount] = u;

  const weightedDaySum = new Float64Array(slotCount);
  return (k, fitted) => {
    weightedDaySum.fill(0);
    for (let i = 0; i < observerCount; i++) {
      const ki = k[i] as number;
      const end = positiveOffsets[i + 1] as number;
      for (let j = positiveOffsets[i] as number; j < end; j++) {
        const slot = positiveSlots[j] as number;
        weightedDaySum[slot] = (weightedDaySum[slot] as number) + ki * (positiveRaws[j] as number);
      }
    }
    for (let slot = 0; slot < slotCount; slot++)
      weightedDaySum[slot] = (weightedDaySum[slot] as number) * (weight[slot] as number);
    for (let i = 0; i < observerCount; i++) {
      if (inNetwork[i] !== 1) continue;
      let sumReference = 0;
      const end = usableOffsets[i + 1] as number;
      for (let j = usableOffsets[i] as number; j < end; j++)
        sumReference += weightedDaySum[usableSlots[j] as number] as number;
      fitted[i] = (sumReference - (k[i] as number) * (sumWeightedRaw[i] as number)) / (sumRaw[i] as number);
    }
  };
}

/** Observations regrouped by observer into flat typed arrays (CSR layout), with days mapped to compact slots. */
type Layout = {
  observerIds: string[];
  observerIndex: Map<string, number>;
  observerCount: number;
  /** Observations of observer i are positions offsets[i] .. offsets[i+1]−1. */
  offsets: Int32Array;
  slots: Int32Array;
  raws: Float64Array;
  slotCount: number;
  maxObservationsPerObserver: number;
};

function buildLayout(observations: ReadonlyArray<NetworkObservation>): Layout {
  const count = observations.length;
  const observerIndex = new Map<string, number>();
  const observerIds: string[] = [];
  const observerOf = new Int32Array(count);
  const dayNumbers = new Int32Array(count);
  const raws = new Float64Array(count);
  for (let j = 0; j < count; j++) {
    const { observerId, day, raw } = observations[j] as NetworkObservation;
    if (!(raw >= 0) || !Number.isFinite(raw)) {
      throw new RangeError(`estimateNetworkK: raw must be finite and >= 0, got ${raw} for ${observerId}`);
    }
    let index = observerIndex.get(observerId);
    if (index === undefined) {
      index = observerIds.length;
      observerIndex.set(observerId, index);
      observerIds.push(observerId);
    }
    observerOf[j] = index;
    dayNumbers[j] = toDayNumber(day);
    raws[j] = raw;
  }
  return layoutColumns({ observerIds, observerIndex, observerOf, dayNumbers, raws });
}

function layoutColumns({
  observerIds,
  observerIndex,
  observerOf,
  dayNumbers,
  raws: rawOf,
}: {
  observerIds: string[];
  observerIndex: Map<string, number>;
  observerOf: Int32Array;
  dayNumbers: Int32Array;
  raws: Float64Array;
}): Layout {
  const count = observerOf.length;
  const observerCount = observerIds.length;
  const offsets = new Int32Array(observerCount + 1);
  // Checked as they are counted, in the pass that counts each observer's
  // counts: raw values finite and >= 0, observers in range, and (days being
  // whole numbers already) the earliest and latest day valid.
  let firstDay = Number.POSITIVE_INFINITY;
  let lastDay = Number.NEGATIVE_INFINITY;
  for (let j = 0; j < count; j++) {
    const index = observerOf[j] as number;
    const value = rawOf[j] as number;
    if (!(value >= 0 && value < Number.POSITIVE_INFINITY)) {
      throw new RangeError(
        `estimateNetworkK: raw must be finite and >= 0, got ${value} for ${observerIds[index]}`,
      );
    }
    if (!(index >= 0 && index < observerCount)) {
      throw new RangeError(`estimateNetworkK: observer index ${index} is out of range`);
    }
    const dayNumber = dayNumbers[j] as number;
    if (dayNumber < firstDay) firstDay = dayNumber;
    if (dayNumber > lastDay) lastDay = dayNumber;
    offsets[index + 1] = (offsets[index + 1] as number) + 1;
  }
  if (count > 0) {
    toDayNumber(firstDay);
    toDayNumber(lastDay);
  }
  const daySlots = assignDaySlots(dayNumbers, lendInt32("layout:day-slots", dayNumbers.length));
  let maxObservationsPerObserver = 0;
  for (let i = 0; i < observerCount; i++) {
    maxObservationsPerObserver = Math.max(maxObservationsPerObserver, offsets[i + 1] as number);
    offsets[i + 1] = (offsets[i + 1] as number) + (offsets[i] as number);
  }
  const cursor = offsets.slice(0, observerCount);
  // Lent (./scratch.ts): every position is written just below.
  const slots = lendInt32("layout:slots", count);
  const raws = lendFloat64("layout:raws", count);
  for (let j = 0; j < count; j++) {
    const i = observerOf[j] as number;
    const position = cursor[i] as number;
    cursor[i] = position + 1;
    slots[position] = daySlots.slots[j] as number;
    raws[position] = rawOf[j] as number;
  }
  // Two counts from one observer on one day would leave one of them inside
  // that observer's own "leave-own-out" reference; the caller must pick or
  // average them first.
  const lastObserverOnDay = new Int32Array(daySlots.slotCount).fill(-1);
  for (let i = 0; i < observerCount; i++) {
    for (let j = offsets[i] as number; j < (offsets[i + 1] as number); j++) {
      const slot = slots[j] as number;
      if (lastObserverOnDay[slot] === i) {
        throw new RangeError(
          `estimateNetworkK: observer "${observerIds[i]}" has more than one count on day ${formatDayNumber(daySlots.dayNumberOfSlot[slot] as number)}`,
        );
      }
      lastObserverOnDay[slot] = i;
    }
  }
  return {
    observerIds,
    observerIndex,
    observerCount,
    offsets,
    slots,
    raws,
    slotCount: daySlots.slotCount,
    maxObservationsPerObserver,
  };
}

/**
 * Chooses who shapes the network index: observers with at least
 * `minCommonDays` days on which both they and another chosen observer
 * counted spots. Dropping one observer can take others below the minimum, so
 * this repeats until nothing changes. Returns 1/0 flags per observer.
 */
function selectNetworkObservers({
  layout,
  minCommonDays,
}: {
  layout: Layout;
  minCommonDays: number;
}): Uint8Array {
  const { observerCount, offsets, slots, raws, slotCount } = layout;
  const chosen = new Uint8Array(observerCount).fill(1);
  const positiveCount = new Int32Array(slotCount);
  for (let i = 0; i < observerCount; i++) {
    for (let j = offsets[i] as number; j < (offsets[i + 1] as number); j++) {
      const slot = slots[j] as number;
      if ((raws[j] as number) > 0) positiveCount[slot] = (positiveCount[slot] as number) + 1;
    }
  }
  const dropped: number[] = [];
  for (;;) {
    dropped.length = 0;
    for (let i = 0; i < observerCount; i++) {
      if (chosen[i] !== 1) continue;
      let common = 0;
      for (let j = offsets[i] as number; j < (offsets[i + 1] as number); j++) {
        if ((raws[j] as number) > 0 && (positiveCount[slots[j] as number] as number) >= 2) common++;
      }
      if (!hasEnoughCommonDays({ n: common, minCommonDays })) dropped.push(i);
    }
    if (dropped.length === 0) return chosen;
    // The next round counts without them: take their days with spots off.
    for (const i of dropped) {
      chosen[i] = 0;
      for (let j = offsets[i] as number; j < (offsets[i + 1] as number); j++) {
        const slot = slots[j] as number;
        if ((raws[j] as number) > 0) positiveCount[slot] = (positiveCount[slot] as number) - 1;
      }
    }
  }
}

/** Flags the chosen observers connected to the pilot through chains of days on which both counted spots (union–find over days). */
function markLinkedToPilot({
  layout,
  inNetwork,
  pilot,
}: {
  layout: Layout;
  inNetwork: Uint8Array;
  pilot: number;
}): Uint8Array {
  const { observerCount, offsets, slots, raws, slotCount } = layout;
  const parent = Int32Array.from({ length: observerCount }, (_, i) => i);
  const find = (x: number): number => {
    let root = x;
    while (parent[root] !== root) root = parent[root] as number;
    while (parent[x] !== root) {
      const next = parent[x] as number;
      parent[x] = root;
      x = next;
    }
    return root;
  };
  const firstOnDay = new Int32Array(slotCount).fill(-1);
  for (let i = 0; i < observerCount; i++) {
    if (inNetwork[i] !== 1) continue;
    // Other sets are only ever attached under i's root, so it stays i's root.
    const root = find(i);
    for (let j = offsets[i] as number; j < (offsets[i + 1] as number); j++) {
      if (!((raws[j] as number) > 0)) continue;
      const slot = slots[j] as number;
      const first = firstOnDay[slot] as number;
      if (first < 0) firstOnDay[slot] = i;
      else {
        const other = find(first);
        if (other !== root) parent[other] = root;
      }
    }
  }
  const pilotRoot = find(pilot);
  const linked = new Uint8Array(observerCount);
  for (let i = 0; i < observerCount; i++) if (inNetwork[i] === 1 && find(i) === pilotRoot) linked[i] = 1;
  return linked;
}

/** Final pass: each observer's fit (n, sigma) against the converged network index. */
function summariseNetwork({
  layout,
  k,
  inNetwork,
  dayCount,
  positiveCount,
  statuses,
  pilot,
  pilotK,
  method,
  leaveOwnOut,
  minCommonDays,
  iterations,
  converged,
  maxRelativeChange,
}: {
  layout: Layout;
  k: Float64Array;
  inNetwork: Uint8Array;
  /** Per slot, the network's counts and those with spots (as fitNetwork counted them). */
  dayCount: Float64Array;
  positiveCount: Float64Array;
  statuses: NetworkKStatus[];
  pilot: number;
  pilotK: number;
  method: KMethod;
  leaveOwnOut: boolean;
  minCommonDays: number;
  iterations: number;
  converged: boolean;
  maxRelativeChange: number;
}): NetworkKResult {
  const { observerIds, observerCount, offsets, slots, raws, slotCount } = layout;
  const daySum = new Float64Array(slotCount);
  for (let i = 0; i < observerCount; i++) {
    if (inNetwork[i] !== 1) continue;
    const ki = k[i] as number;
    for (let j = offsets[i] as number; j < (offsets[i + 1] as number); j++) {
      const slot = slots[j] as number;
      daySum[slot] = (daySum[slot] as number) + ki * (raws[j] as number);
    }
  }

  const references = new Float64Array(layout.maxObservationsPerObserver);
  const pairRaws = new Float64Array(layout.maxObservationsPerObserver);
  const scratch = new Float64Array(layout.maxObservationsPerObserver);
  const fitAgainstNetwork = (i: number): KEstimate => {
    const member = inNetwork[i] === 1;
    const ownOut = member && leaveOwnOut;
    let n = 0;
    for (let j = offsets[i] as number; j < (offsets[i + 1] as number); j++) {
      const raw = raws[j] as number;
      const slot = slots[j] as number;
      const others = (positiveCount[slot] as number) - (member && raw > 0 ? 1 : 0);
      if (!(raw > 0) || others < 1) continue;
      const divisor = (dayCount[slot] as number) - (ownOut ? 1 : 0);
      references[n] = ((daySum[slot] as number) - (ownOut ? (k[i] as number) * raw : 0)) / divisor;
      pairRaws[n] = raw;
      n++;
    }
    return fitK({ references, raws: pairRaws, n, method, minCommonDays, scratch });
  };

  const byObserver = new Map<string, NetworkKEstimate>();
  const pilotAgainstNetwork = fitAgainstNetwork(pilot);
  // Same rescaling as in the iteration, so that below-minimum observers land
  // on the pilot's scale like everyone else.
  const scale = pilotAgainstNetwork.k === null ? 1 : pilotK / pilotAgainstNetwork.k;
  for (let i = 0; i < observerCount; i++) {
    const id = observerIds[i] as string;
    const status = statuses[i] as NetworkKStatus;
    const fit = status === "unlinked" ? null : i === pilot ? pilotAgainstNetwork : fitAgainstNetwork(i);
    if (fit === null || fit.k === null) {
      byObserver.set(id, { k: null, n: 0, sigma: null, method, meetsMinimum: false, status });
      continue;
    }
    const sigma = status === "pilot" ? 0 : fit.sigma === null ? null : fit.sigma * scale;
    // Network members report the k that built the index (their rescaled fit
    // differs by less than the tolerance), so the k table reproduces the
    // index exactly.
    const value = status === "below-minimum" ? fit.k * scale : (k[i] as number);
    byObserver.set(id, { ...fit, k: value, sigma, status });
  }
  return { byObserver, iterations, converged, maxRelativeChange, pilotAgainstNetwork };
}
