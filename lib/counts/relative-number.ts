/**
 * The relative (Wolf) number R = k(10g + s), R. Wolf 1850s; see Clette et al.
 * 2014, "Revisiting the Sunspot Number", Space Science Reviews 186, 35–103.
 *
 * Values keep full floating-point precision everywhere; rounding happens only
 * in {@link roundRelativeNumberForDisplay}, so sums, means and k fits never
 * inherit display rounding.
 */

export type SpotCount = { groups: number; spots: number };

/** Ten spots per group: Wolf's weighting, which makes a new single-spot group count 11. */
export const SPOTS_PER_GROUP_WEIGHT = 10;

function assertCount(name: string, value: number): void {
  if (!Number.isInteger(value) || value < 0) {
    throw new RangeError(`${name} must be a whole number of at least 0, got ${value}`);
  }
}

/**
 * The raw count 10g + s. Throws on negative or fractional counts: they can
 * only come from a bug or a corrupted import, and silently scaling them would
 * hide the error in the network series.
 */
export function computeRawCount({ groups, spots }: SpotCount): number {
  assertCount("groups", groups);
  assertCount("spots", spots);
  return SPOTS_PER_GROUP_WEIGHT * groups + spots;
}

/** R = k(10g + s) at full precision. `k` must be a positive finite number. */
export function computeRelativeNumber({ k, groups, spots }: SpotCount & { k: number }): number {
  if (!Number.isFinite(k) || k <= 0) throw new RangeError(`k must be a positive finite number, got ${k}`);
  return k * computeRawCount({ groups, spots });
}

/**
 * Checks that a count is physically possible: every spot belongs to a group
 * and every group has at least one spot. Returns a reason code, or null when
 * the pair is consistent. The validation schema enforces the same rule on
 * input; this copy lets imported series be screened without zod.
 */
export function findCountInconsistency({
  groups,
  spots,
}: SpotCount): "spots-without-groups" | "fewer-spots-than-groups" | null {
  if (groups === 0 && spots > 0) return "spots-without-groups";
  if (spots < groups) return "fewer-spots-than-groups";
  return null;
}

/**
 * Rounds a relative number for tables and charts. One decimal by default:
 * k is usually quoted to two or three significant figures, so further
 * decimals would suggest precision the coefficient does not have. Returns a
 * number (not a string) so the caller can still format it for the locale.
 */
export function roundRelativeNumberForDisplay({
  relativeNumber,
  decimals = 1,
}: {
  relativeNumber: number;
  decimals?: number;
}): number {
  const factor = 10 ** decimals;
  // Products like 0.15 × 10 land a hair below an exact half
  // (1.4999999999999998); a few ulps of nudge makes them round the way a
  // person working on paper would.
  return Math.round(relativeNumber * factor * (1 + 4 * Number.EPSILON)) / factor;
}
