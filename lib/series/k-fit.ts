/**
 * k per observer and instrument (a "unit") and per period, around the
 * estimators of lib/counts/k-coefficient.ts: against an imported reference
 * series, or against the network itself with a pilot held fixed.
 *
 * An observer's k belongs to the instrument too: a pinhole box and a small
 * refractor used by the same person see different numbers of spots, so each
 * pair gets its own k (PRODUCT.md: k "absorbs the instrument, the site, the
 * seeing and the observer's own eye").
 */

import {
  detectKDrift,
  estimateK,
  estimateNetworkKFromColumns,
  type KMethod,
  type KPair,
} from "@/lib/counts/k-coefficient";

import { lendFloat64, lendInt32 } from "@/lib/counts/scratch";

import type { AcceptedCounts } from "./accepted-counts";

export type KUnit = { observerId: string; instrumentId: string };

export type KReference =
  | {
      kind: "network";
      /** Whose k sets the network's scale; null lets the busiest unit of each period stand in. */
      pilotObserverId: string | null;
      pilotK: number;
    }
  | { kind: "series"; valueOfDay: (dayNumber: number) => number | undefined };

/**
 * - pilot: the chosen pilot, k held at pilotK;
 * - stand-in pilot: the pilot had too few days this period; another unit was
 *   held at its k of the period before (or at pilotK without one);
 * - network: fitted against the network index;
 * - reference: fitted against an imported reference series.
 */
export type KFitRole = "pilot" | "stand-in pilot" | "network" | "reference";

export type KFit = {
  unit: number;
  periodIndex: number;
  k: number;
  sigma: number | null;
  commonDays: number;
  role: KFitRole;
};

export type PeriodKResult = {
  fits: KFit[];
  /** The unit held fixed in the pilot's place, the k it was held at, and whether that k came from another period. */
  standIn: { unit: number; k: number; anchored: boolean } | null;
  /** Counts existed but no unit reached the minimum of common days. */
  unfitted: boolean;
};

/**
 * Per-unit daily raw counts of one period, with repeated counts of a unit on
 * one day averaged; `daysOfUnit[unit]` is how many days the unit counted.
 */
type PeriodPairs = {
  unit: Int32Array;
  dayNumber: Int32Array;
  raw: Float64Array;
  length: number;
  daysOfUnit: Int32Array;
};

function collectPeriodCounts({
  counts,
  from,
  to,
  unitCount,
}: {
  counts: AcceptedCounts;
  from: number;
  to: number;
  unitCount: number;
}): PeriodPairs {
  const size = to - from;
  const pairs: PeriodPairs = {
    // Lent (lib/counts/scratch.ts): every element read below is written first.
    unit: lendInt32("period-counts:unit", size),
    dayNumber: lendInt32("period-counts:day", size),
    raw: lendFloat64("period-counts:raw", size),
    length: 0,
    daysOfUnit: new Int32Array(unitCount),
  };
  const lastDay = new Int32Array(unitCount).fill(-2_000_000_000);
  const position = new Int32Array(unitCount);
  const repeats = lendFloat64("period-counts:repeats", size);
  for (let i = from; i < to; i++) {
    const unit = counts.unit[i] as number;
    const day = counts.dayNumber[i] as number;
    const raw = counts.raw[i] as number;
    if (lastDay[unit] === day) {
      // Rows are in day order, so a repeat of (unit, day) is always the latest entry of that unit.
      const at = position[unit] as number;
      repeats[at] = (repeats[at] as number) + 1;
      pairs.raw[at] = (pairs.raw[at] as number) + (raw - (pairs.raw[at] as number)) / (repeats[at] as number);
      continue;
    }
    const at = pairs.length++;
    lastDay[unit] = day;
    position[unit] = at;
    pairs.daysOfUnit[unit] = (pairs.daysOfUnit[unit] as number) + 1;
    repeats[at] = 1;
    pairs.unit[at] = unit;
    pairs.dayNumber[at] = day;
    pairs.raw[at] = raw;
  }
  return pairs;
}

/**
 * Fits every unit's k for one period: rows [from, to) of `counts`, all in
 * the period. Only fits resting on at least `minCommonDays` common days are
 * returned. `anchorK[unit]` is the unit's k in the nearest period that has
 * one (NaN if none): a stand-in pilot is held at it, which keeps the scale
 * continuous when the pilot is away for a period. `standIn` names that unit, and
 * `unfitted` is true when counts existed but no k could be fitted; the
 * caller tells the coordinator about both.
 */
export function fitPeriodK({
  counts,
  from,
  to,
  units,
  periodIndex,
  method,
  minCommonDays,
  reference,
  anchorK,
}: {
  counts: AcceptedCounts;
  from: number;
  to: number;
  units: ReadonlyArray<KUnit>;
  periodIndex: number;
  method: KMethod;
  minCommonDays: number;
  reference: KReference;
  anchorK: Float64Array;
}): PeriodKResult {
  const pairs = collectPeriodCounts({ counts, from, to, unitCount: units.length });
  if (reference.kind === "series") {
    const fits = fitAgainstSeries({
      pairs,
      units,
      periodIndex,
      method,
      minCommonDays,
      valueOfDay: reference.valueOfDay,
    });
    return { fits, standIn: null, unfitted: pairs.length > 0 && fits.length === 0 };
  }

  const keys = units.map((_, i) => String(i));
  const observationsOfUnit = pairs.daysOfUnit;
  const columns = {
    observerIds: keys,
    observer: pairs.unit,
    day: pairs.dayNumber,
    raw: pairs.raw,
    length: pairs.length,
  };
  const byActivity = units
    .map((_, unit) => unit)
    .filter((unit) => (observationsOfUnit[unit] as number) >= minCommonDays)
    .sort((a, b) => (observationsOfUnit[b] as number) - (observationsOfUnit[a] as number));
  const pilotUnits = byActivity.filter((unit) => units[unit]?.observerId === reference.pilotObserverId);
  const standIns = [
    ...byActivity.filter((unit) => !pilotUnits.includes(unit) && Number.isFinite(anchorK[unit])),
    ...byActivity.filter((unit) => !pilotUnits.includes(unit) && !Number.isFinite(anchorK[unit])),
  ];
  // The pilot's busiest instrument first; a few stand-ins after it. Each try
  // that fails (too few common days) costs one pass over the period only.
  const candidates = [
    ...pilotUnits.slice(0, 1).map((unit) => ({ unit, k: reference.pilotK, standIn: false, anchored: false })),
    ...standIns.slice(0, 3).map((unit) => ({
      unit,
      k: Number.isFinite(anchorK[unit]) ? (anchorK[unit] as number) : reference.pilotK,
      standIn: true,
      anchored: Number.isFinite(anchorK[unit]),
    })),
  ];
  for (const candidate of candidates) {
    let result: ReturnType<typeof estimateNetworkKFromColumns>;
    try {
      result = estimateNetworkKFromColumns({
        columns,
        pilotId: keys[candidate.unit] as string,
        pilotK: candidate.k,
        method,
        minCommonDays,
      });
    } catch (error) {
      if (error instanceof RangeError) continue;
      throw error;
    }
    const fits: KFit[] = [];
    for (const [key, estimate] of result.byObserver) {
      if (estimate.k === null || !estimate.meetsMinimum) continue;
      if (estimate.status !== "pilot" && estimate.status !== "network") continue;
      fits.push({
        unit: Number(key),
        periodIndex,
        k: estimate.k,
        sigma: estimate.sigma,
        commonDays: estimate.n,
        role: estimate.status === "pilot" ? (candidate.standIn ? "stand-in pilot" : "pilot") : "network",
      });
    }
    return {
      fits,
      standIn: candidate.standIn
        ? { unit: candidate.unit, k: candidate.k, anchored: candidate.anchored }
        : null,
      unfitted: false,
    };
  }
  return { fits: [], standIn: null, unfitted: pairs.length > 0 };
}

function fitAgainstSeries({
  pairs,
  units,
  periodIndex,
  method,
  minCommonDays,
  valueOfDay,
}: {
  pairs: PeriodPairs;
  units: ReadonlyArray<KUnit>;
  periodIndex: number;
  method: KMethod;
  minCommonDays: number;
  valueOfDay: (dayNumber: number) => number | undefined;
}): KFit[] {
  const pairsOfUnit: KPair[][] = units.map(() => []);
  for (let j = 0; j < pairs.length; j++) {
    const reference = valueOfDay(pairs.dayNumber[j] as number);
    if (reference === undefined) continue;
    pairsOfUnit[pairs.unit[j] as number]!.push({ reference, raw: pairs.raw[j] as number });
  }
  const fits: KFit[] = [];
  pairsOfUnit.forEach((unitPairs, unit) => {
    if (unitPairs.length < minCommonDays) return;
    const estimate = estimateK(unitPairs, method, { minCommonDays });
    if (estimate.k === null || !estimate.meetsMinimum) return;
    fits.push({
      unit,
      periodIndex,
      k: estimate.k,
      sigma: estimate.sigma,
      commonDays: estimate.n,
      role: "reference",
    });
  });
  return fits;
}

/**
 * The k that scales a unit's counts in a period: its own k for that period,
 * else its latest k, else 1.0 (raw counts stand as they are). The same rule
 * as the incremental refresh in db/queries/series.ts, so both agree.
 */
export function buildKLookup({ fits, unitCount }: { fits: ReadonlyArray<KFit>; unitCount: number }) {
  const byUnit: Array<Map<number, number>> = Array.from({ length: unitCount }, () => new Map());
  const latest = new Float64Array(unitCount).fill(Number.NaN);
  const latestPeriod = new Float64Array(unitCount).fill(Number.NEGATIVE_INFINITY);
  for (const fit of fits) {
    byUnit[fit.unit]!.set(fit.periodIndex, fit.k);
    if (fit.periodIndex > (latestPeriod[fit.unit] as number)) {
      latestPeriod[fit.unit] = fit.periodIndex;
      latest[fit.unit] = fit.k;
    }
  }
  return (unit: number, periodIndex: number): number => {
    const own = byUnit[unit]?.get(periodIndex);
    if (own !== undefined) return own;
    const fallback = latest[unit] as number;
    return Number.isFinite(fallback) ? fallback : 1;
  };
}

export type KHistoryEntry = { periodStart: string; periodEnd: string; k: number; sigma: number | null };

export type KDriftAlert<Entry extends KHistoryEntry = KHistoryEntry> = {
  previous: Entry;
  current: Entry;
  relativeChange: number;
  zScore: number | null;
};

/**
 * Drift alerts along one unit's history (entries in period order): every
 * step where k moved by more than `maxFraction` from the period before
 * (detectKDrift of lib/counts/k-coefficient.ts). Gaps of missing periods
 * are compared across: the coordinator wants to know the k changed, however
 * long the observer was away.
 */
export function findKDrifts<Entry extends KHistoryEntry>({
  history,
  maxFraction,
}: {
  history: ReadonlyArray<Entry>;
  maxFraction: number;
}): Array<KDriftAlert<Entry>> {
  const alerts: Array<KDriftAlert<Entry>> = [];
  for (let i = 1; i < history.length; i++) {
    const previous = history[i - 1]!;
    const current = history[i]!;
    const drift = detectKDrift({ previous, current, maxFraction });
    if (drift.isDrift && drift.relativeChange !== null) {
      alerts.push({ previous, current, relativeChange: drift.relativeChange, zScore: drift.zScore });
    }
  }
  return alerts;
}

export type StoredK = {
  observerId: string;
  instrumentId: string | null;
  periodStart: string;
  periodEnd: string;
  k: number;
  /** Milliseconds; the newer of two overlapping coefficients wins. */
  computedAt: number;
};

/**
 * The same rule as K_FOR_OBSERVATION_SQL in db/queries/series.ts, over
 * coefficients already in memory: the instrument's k for the period holding
 * the day, else the observer's k kept without an instrument for that period,
 * else the instrument's newest k, else the observer's newest, else 1.0.
 * Used when the series is rebuilt from stored coefficients without refitting.
 */
export function buildStoredKResolver(rows: ReadonlyArray<StoredK>) {
  const byInstrument = new Map<string, StoredK[]>();
  const byObserver = new Map<string, StoredK[]>();
  for (const row of rows) {
    const map = row.instrumentId === null ? byObserver : byInstrument;
    const key = row.instrumentId === null ? row.observerId : `${row.observerId}|${row.instrumentId}`;
    const list = map.get(key);
    if (list) list.push(row);
    else map.set(key, [row]);
  }
  const containing = (list: StoredK[] | undefined, day: string) => {
    let best: StoredK | undefined;
    for (const row of list ?? []) {
      if (row.periodStart > day || row.periodEnd < day) continue;
      if (
        !best ||
        row.periodEnd < best.periodEnd ||
        (row.periodEnd === best.periodEnd && row.computedAt > best.computedAt)
      )
        best = row;
    }
    return best;
  };
  const newest = (list: StoredK[] | undefined) => {
    let best: StoredK | undefined;
    for (const row of list ?? []) {
      if (
        !best ||
        row.periodEnd > best.periodEnd ||
        (row.periodEnd === best.periodEnd && row.computedAt > best.computedAt)
      )
        best = row;
    }
    return best;
  };
  return ({
    observerId,
    instrumentId,
    day,
  }: {
    observerId: string;
    instrumentId: string;
    day: string;
  }): number => {
    const own = byInstrument.get(`${observerId}|${instrumentId}`);
    const overall = byObserver.get(observerId);
    return (containing(own, day) ?? containing(overall, day) ?? newest(own) ?? newest(overall))?.k ?? 1;
  };
}
