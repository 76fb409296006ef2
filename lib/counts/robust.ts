/**
 * Robust statistics for checking counts: median, scaled MAD and the flags a
 * coordinator sees on the Review desk. Median and MAD are used rather than
 * mean and standard deviation because the values being judged are exactly
 * the ones that may be wrong, and one copying slip (137 typed for 17)
 * would otherwise inflate the spread enough to hide itself.
 */

/**
 * Factor that turns the median absolute deviation into an estimate of the
 * standard deviation for normally distributed data (1 / Φ⁻¹(3/4)), so that
 * robust z-scores read on the familiar "3 sigma" scale.
 */
export const MAD_TO_SIGMA = 1.4826;

/**
 * Median of the first `length` values of a scratch buffer, reordering the
 * buffer. Used by hot loops (median of ratios over a million observations)
 * that reuse one buffer instead of copying. NaN when length is 0.
 */
export function computeMedianInPlace(buffer: Float64Array, length: number = buffer.length): number {
  if (length <= 0) return Number.NaN;
  const upper = length >> 1;
  selectInPlace(buffer, 0, length - 1, upper);
  const upperValue = buffer[upper] as number;
  if (length % 2 === 1) return upperValue;
  // After selection every value left of `upper` is <= upperValue, so the
  // lower middle value is their maximum.
  let lowerValue = buffer[0] as number;
  for (let i = 1; i < upper; i++) {
    const v = buffer[i] as number;
    if (v > lowerValue) lowerValue = v;
  }
  return (lowerValue + upperValue) / 2;
}

/** Median of finite numbers; NaN for an empty list. The input is not modified. */
export function computeMedian(values: ArrayLike<number>): number {
  return computeMedianInPlace(Float64Array.from(values), values.length);
}

/**
 * Median absolute deviation about the median, scaled by {@link MAD_TO_SIGMA}
 * so it estimates a standard deviation. NaN for an empty list.
 */
export function computeMad(values: ArrayLike<number>): number {
  const n = values.length;
  if (n === 0) return Number.NaN;
  const buffer = Float64Array.from(values);
  const median = computeMedianInPlace(buffer, n);
  for (let i = 0; i < n; i++) buffer[i] = Math.abs((values[i] as number) - median);
  return MAD_TO_SIGMA * computeMedianInPlace(buffer, n);
}

export type RobustScale = { median: number; scale: number; n: number };

/**
 * Median and a robust spread for z-scores. When more than half the values
 * are identical the MAD is 0 (common on quiet days, when most observers
 * report 0 or 11), so we fall back to the mean absolute deviation about the
 * median, scaled by √(π/2) ≈ 1.2533 to estimate σ for normal data; if that
 * is 0 too, the caller's `minScale` decides.
 */
export function computeRobustScale({
  values,
  minScale = 0,
}: {
  values: ArrayLike<number>;
  minScale?: number;
}): RobustScale {
  const n = values.length;
  if (n === 0) return { median: Number.NaN, scale: Number.NaN, n: 0 };
  const median = computeMedian(values);
  let scale = computeMad(values);
  if (scale === 0) {
    let sumAbs = 0;
    for (let i = 0; i < n; i++) sumAbs += Math.abs((values[i] as number) - median);
    scale = 1.2533 * (sumAbs / n);
  }
  return { median, scale: Math.max(scale, minScale), n };
}

/** Robust z-score; ±Infinity when the scale is 0 and the value differs from the median. */
function computeRobustZ({ value, median, scale }: { value: number; median: number; scale: number }): number {
  const deviation = value - median;
  if (deviation === 0) return 0;
  return scale > 0 ? deviation / scale : Math.sign(deviation) * Number.POSITIVE_INFINITY;
}

export type OutlierFlag = {
  isOutlier: boolean;
  /** (value − median) / robust σ; null when there were too few values to judge. */
  robustZ: number | null;
  median: number | null;
  /** Robust σ used: scaled MAD, or its fallback when the MAD is 0. */
  scale: number | null;
  /** How many comparison values were used. */
  n: number;
};

/**
 * Flags a value (normally one observer's scaled count k(10g+s) for a day)
 * that sits more than `threshold` robust standard deviations from the median
 * of the day's values.
 *
 * Pass the day's *other* values as `dayValues`: leaving the candidate out
 * stops a wild value from dragging the median and MAD towards itself, which
 * matters on days with only a handful of observers. With fewer than
 * `minValues` comparison values nothing is flagged, because the median of two
 * numbers says little about what is normal. `minScale` (in the units of the
 * values) sets a floor on the spread so that, on a day where everyone else
 * agrees exactly, a difference of one spot is not an "infinite" outlier;
 * the default 0 keeps the pure statistic.
 */
export function flagOutlier({
  value,
  dayValues,
  threshold = 3,
  minValues = 3,
  minScale = 0,
}: {
  value: number;
  dayValues: ArrayLike<number>;
  threshold?: number;
  minValues?: number;
  minScale?: number;
}): OutlierFlag {
  if (!Number.isFinite(value)) throw new RangeError(`flagOutlier: value must be finite, got ${value}`);
  if (dayValues.length < minValues) {
    return { isOutlier: false, robustZ: null, median: null, scale: null, n: dayValues.length };
  }
  const { median, scale, n } = computeRobustScale({ values: dayValues, minScale });
  const robustZ = computeRobustZ({ value, median, scale });
  return { isOutlier: Math.abs(robustZ) > threshold, robustZ, median, scale, n };
}

export type SpotsPerGroupFlag = {
  isUnusual: boolean;
  /** Why the count was flagged (or could not be judged); null when it looks ordinary. */
  reason:
    | "spots-without-groups"
    | "fewer-spots-than-groups"
    | "ratio-far-from-history"
    | "too-little-history"
    | "no-groups"
    | null;
  /** s/g for the day; null when g = 0. */
  spotsPerGroup: number | null;
  /** The observer's usual s/g (median over history days with groups). */
  typicalSpotsPerGroup: number | null;
  /** Robust z-score of ln(s/g) against the observer's history; null when not computed. */
  robustZ: number | null;
  historyDays: number;
};

/**
 * Flags a day whose spots-per-group ratio s/g is unusual for this observer.
 * The relative number weights a group as ten spots, so a day with the usual
 * total but an odd split (groups counted as spots, or a large group split in
 * two) is invisible to {@link flagOutlier} yet changes R; comparing s/g with
 * the observer's own history catches it without penalising an observer whose
 * telescope simply resolves more spots per group than a pinhole box does.
 *
 * Works on ln(s/g): the ratio is bounded below by 1 and skewed to the right,
 * and the logarithm makes "twice as many" and "half as many" equally unusual.
 * Days with g = 0 carry no ratio and are skipped in the history. Impossible
 * pairs (spots without groups, fewer spots than groups) are always flagged.
 */
export function flagUnusualSpotsPerGroup({
  groups,
  spots,
  history,
  threshold = 3,
  minHistoryDays = 10,
}: {
  groups: number;
  spots: number;
  /** The observer's earlier accepted counts (ideally with the same instrument). */
  history: ReadonlyArray<{ groups: number; spots: number }>;
  threshold?: number;
  minHistoryDays?: number;
}): SpotsPerGroupFlag {
  const base = { spotsPerGroup: null, typicalSpotsPerGroup: null, robustZ: null, historyDays: 0 };
  if (groups === 0) {
    return spots > 0
      ? { ...base, isUnusual: true, reason: "spots-without-groups" }
      : { ...base, isUnusual: false, reason: "no-groups" };
  }
  const spotsPerGroup = spots / groups;
  if (spots < groups) return { ...base, spotsPerGroup, isUnusual: true, reason: "fewer-spots-than-groups" };

  const logRatios: number[] = [];
  for (const day of history) {
    if (day.groups > 0 && day.spots >= day.groups) logRatios.push(Math.log(day.spots / day.groups));
  }
  if (logRatios.length < minHistoryDays) {
    return {
      ...base,
      spotsPerGroup,
      historyDays: logRatios.length,
      isUnusual: false,
      reason: "too-little-history",
    };
  }
  // A floor of 0.05 in ln units (about 5%) keeps an observer who always
  // reports exactly the same ratio from being flagged for a one-spot change.
  const { median, scale } = computeRobustScale({ values: logRatios, minScale: 0.05 });
  const robustZ = computeRobustZ({ value: Math.log(spotsPerGroup), median, scale });
  const isUnusual = Math.abs(robustZ) > threshold;
  return {
    isUnusual,
    reason: isUnusual ? "ratio-far-from-history" : null,
    spotsPerGroup,
    typicalSpotsPerGroup: Math.exp(median),
    robustZ,
    historyDays: logRatios.length,
  };
}

/**
 * Hoare-style quickselect: afterwards buffer[k] holds the value it would have
 * if [left, right] were sorted, with smaller-or-equal values to its left.
 * Median-of-three pivots keep sorted or constant input from going quadratic.
 */
function selectInPlace(buffer: Float64Array, left: number, right: number, k: number): void {
  let lo = left;
  let hi = right;
  while (hi > lo) {
    const mid = (lo + hi) >> 1;
    const a = buffer[lo] as number;
    const b = buffer[mid] as number;
    const c = buffer[hi] as number;
    const pivot = a < b ? (b < c ? b : a < c ? c : a) : a < c ? a : b < c ? c : b;
    let i = lo;
    let j = hi;
    while (i <= j) {
      while ((buffer[i] as number) < pivot) i++;
      while ((buffer[j] as number) > pivot) j--;
      if (i <= j) {
        const t = buffer[i] as number;
        buffer[i] = buffer[j] as number;
        buffer[j] = t;
        i++;
        j--;
      }
    }
    if (k <= j) hi = j;
    else if (k >= i) lo = i;
    else return;
  }
}
