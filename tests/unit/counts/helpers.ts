/**
 * Seeded synthetic data for the counts tests and the benchmark. Everything
 * here is invented: smooth activity curves and personal k values chosen by
 * the test, never real measurements.
 */

/**
 * mulberry32: a tiny 32-bit seeded PRNG (Tommy Ettinger's public-domain
 * generator). Not cryptographic; it only has to make every run of the tests
 * see the same numbers.
 */
export function createRandom(seed: number): () => number {
  let state = seed >>> 0;
  return () => {
    state = (state + 0x6d2b79f5) >>> 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** Standard normal deviate (Box–Muller) from a uniform generator. */
export function drawGaussian(random: () => number): number {
  const u = 1 - random(); // (0, 1], so the logarithm is finite
  return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * random());
}

/**
 * Counting noise for an expected count μ:
 * - "poisson": normal approximation to Poisson, variance μ;
 * - "uniform-sqrt": uniform within ±√μ, variance μ/3.
 * Rounded to a whole count and never negative.
 */
export function drawCount({
  mean,
  noise,
  random,
}: {
  mean: number;
  noise: "poisson" | "uniform-sqrt";
  random: () => number;
}): number {
  const spread = Math.sqrt(mean);
  const deviation = noise === "poisson" ? spread * drawGaussian(random) : spread * (2 * random() - 1);
  return Math.max(0, Math.round(mean + deviation));
}

/** An invented smooth activity level (reference scale, k = 1) for day t of the run. */
export function computeSyntheticActivity({
  dayIndex,
  minimum,
  maximum,
}: {
  dayIndex: number;
  minimum: number;
  maximum: number;
}): number {
  // A slow rise and fall plus a 27-day rotational modulation: enough shape
  // that busy and quiet days differ, as they do in a real month.
  const slow = 0.5 - 0.5 * Math.cos((2 * Math.PI * dayIndex) / 400);
  const rotation = 0.15 * Math.sin((2 * Math.PI * dayIndex) / 27);
  return minimum + (maximum - minimum) * Math.min(1, Math.max(0, slow + rotation));
}

export type SyntheticObservation = {
  observerId: string;
  day: number;
  groups: number;
  spots: number;
  raw: number;
};

export type SyntheticNetwork = {
  observations: SyntheticObservation[];
  trueK: Map<string, number>;
  /** Imported reference per day number: the true activity with its own small noise. */
  reference: Map<number, number>;
  observerIds: string[];
};

/**
 * A network of observers with known k. Observer i's raw count 10g + s is the
 * true activity A (reference scale) divided by k_i, plus counting noise on
 * the whole raw count, then split into a plausible g and s (about 8 spots per
 * group; the split does not change raw). Each observer observes a day with
 * probability `coverage` (cloud). k values are spread evenly over
 * [kMin, kMax] so both ends are always tested, then shuffled among observers.
 */
export function generateSyntheticNetwork({
  seed,
  observerCount,
  dayCount,
  firstDayNumber = 20_000,
  kMin = 0.6,
  kMax = 1.4,
  coverage = 1,
  noise = "uniform-sqrt",
  activityMinimum = 200,
  activityMaximum = 350,
  referenceNoiseFraction = 0.01,
}: {
  seed: number;
  observerCount: number;
  dayCount: number;
  firstDayNumber?: number;
  kMin?: number;
  kMax?: number;
  coverage?: number;
  noise?: "poisson" | "uniform-sqrt" | "none";
  activityMinimum?: number;
  activityMaximum?: number;
  referenceNoiseFraction?: number;
}): SyntheticNetwork {
  const random = createRandom(seed);
  const observerIds = Array.from({ length: observerCount }, (_, i) => `obs-${String(i).padStart(3, "0")}`);
  const kValues = observerIds.map((_, i) =>
    observerCount === 1 ? kMin : kMin + ((kMax - kMin) * i) / (observerCount - 1),
  );
  for (let i = kValues.length - 1; i > 0; i--) {
    const j = Math.floor(random() * (i + 1));
    [kValues[i], kValues[j]] = [kValues[j] as number, kValues[i] as number];
  }
  const trueK = new Map(observerIds.map((id, i) => [id, kValues[i] as number]));
  const observations: SyntheticObservation[] = [];
  const reference = new Map<number, number>();
  for (let dayIndex = 0; dayIndex < dayCount; dayIndex++) {
    const activity = computeSyntheticActivity({
      dayIndex,
      minimum: activityMinimum,
      maximum: activityMaximum,
    });
    const day = firstDayNumber + dayIndex;
    reference.set(day, activity * (1 + referenceNoiseFraction * (2 * random() - 1)));
    observerIds.forEach((observerId, i) => {
      if (random() >= coverage) return;
      const mean = activity / (kValues[i] as number);
      // Below 11 a count is impossible (one group of one spot is 11); those
      // draws only happen many sigma down, and become a spotless report.
      const drawn = noise === "none" ? mean : drawCount({ mean, noise, random });
      const raw = noise !== "none" && drawn < 11 ? 0 : drawn;
      observations.push({ observerId, day, ...splitRawCount(raw), raw });
    });
  }
  return { observations, trueK, reference, observerIds };
}

/**
 * Splits a raw count into groups and spots with about 8 spots per group and
 * at least one spot per group. With `noise: "none"` raw is fractional and so
 * is the split; those tests only use raw.
 */
export function splitRawCount(raw: number): { groups: number; spots: number } {
  if (raw === 0) return { groups: 0, spots: 0 };
  if (!Number.isInteger(raw)) return { groups: raw / 18, spots: (raw * 8) / 18 };
  if (raw < 11)
    throw new RangeError(
      `raw ${raw} cannot be split: the smallest non-zero count is one group of one spot (11)`,
    );
  const groups = Math.max(1, Math.floor(raw / 18));
  return { groups, spots: raw - 10 * groups };
}
