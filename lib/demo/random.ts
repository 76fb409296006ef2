/** mulberry32: a tiny, well-known seeded generator, so the demo is the same on every machine. */
export function makeRandom(seed: number) {
  let state = seed >>> 0;
  const next = () => {
    state = (state + 0x6d2b79f5) >>> 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  const poisson = (mean: number): number => {
    if (mean <= 0) return 0;
    if (mean > 40) {
      // Normal approximation: exact sampling is slow for large means.
      const u = Math.max(next(), 1e-12);
      const v = next();
      const z = Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * v);
      return Math.max(0, Math.round(mean + z * Math.sqrt(mean)));
    }
    const limit = Math.exp(-mean);
    let k = 0;
    let p = next();
    while (p > limit) {
      k++;
      p *= next();
    }
    return k;
  };
  const binomial = (n: number, p: number): number => {
    let hits = 0;
    for (let i = 0; i < n; i++) if (next() < p) hits++;
    return hits;
  };
  const pick = <T>(items: readonly T[]): T => items[Math.floor(next() * items.length)] as T;
  return { next, poisson, binomial, pick, between: (lo: number, hi: number) => lo + (hi - lo) * next() };
}
export type Random = ReturnType<typeof makeRandom>;
