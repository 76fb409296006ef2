import "server-only";

import { asc, count, eq, inArray, max } from "drizzle-orm";

import { detectKDrift, K_METHODS, type KMethod } from "@/lib/counts/k-coefficient";
import { K_PERIOD_KINDS, type KPeriodKind } from "@/lib/series/periods";
import {
  DEFAULT_K_SETTINGS,
  K_SETTING_KEYS,
  type KSettings,
  type KSettingsInput,
} from "@/lib/validation/k-settings";

import { getDb } from "../client";
import { instruments, kCoefficients, observers, referenceSeries, settings } from "../schema";

// ---------------------------------------------------------------------------
// Settings
// ---------------------------------------------------------------------------

/** The coordinator's k settings, with the defaults for anything never saved (or saved with a value no longer valid). */
export async function getKSettings(): Promise<KSettings> {
  const keys = Object.values(K_SETTING_KEYS);
  const rows = await getDb().select().from(settings).where(inArray(settings.key, keys));
  const value = (key: string) => rows.find((r) => r.key === key)?.value;
  const number = (key: string, fallback: number) => {
    const v = value(key);
    return typeof v === "number" && Number.isFinite(v) ? v : fallback;
  };
  const text = (key: string) => {
    const v = value(key);
    return typeof v === "string" && v !== "" ? v : null;
  };
  const periodKind = text(K_SETTING_KEYS.periodKind);
  const method = text(K_SETTING_KEYS.method);
  return {
    periodKind: K_PERIOD_KINDS.includes(periodKind as KPeriodKind)
      ? (periodKind as KPeriodKind)
      : DEFAULT_K_SETTINGS.periodKind,
    method: K_METHODS.includes(method as KMethod) ? (method as KMethod) : DEFAULT_K_SETTINGS.method,
    minCommonDays: number(K_SETTING_KEYS.minCommonDays, DEFAULT_K_SETTINGS.minCommonDays),
    pilotObserverId: text(K_SETTING_KEYS.pilotObserverId),
    pilotK: number(K_SETTING_KEYS.pilotK, DEFAULT_K_SETTINGS.pilotK),
    referenceSeriesId: text(K_SETTING_KEYS.referenceSeriesId) ?? DEFAULT_K_SETTINGS.referenceSeriesId,
    driftFraction: number(K_SETTING_KEYS.driftFraction, DEFAULT_K_SETTINGS.driftFraction),
  };
}

export async function saveKSettings({ input }: { input: KSettingsInput }): Promise<void> {
  const now = new Date();
  const entries: Array<[string, unknown]> = [
    [K_SETTING_KEYS.periodKind, input.periodKind],
    [K_SETTING_KEYS.method, input.method],
    [K_SETTING_KEYS.minCommonDays, input.minCommonDays],
    [K_SETTING_KEYS.pilotObserverId, input.pilotObserverId ?? ""],
    [K_SETTING_KEYS.pilotK, input.pilotK],
    [K_SETTING_KEYS.referenceSeriesId, input.referenceSeriesId],
    [K_SETTING_KEYS.driftFraction, input.driftFraction],
  ];
  await getDb().transaction(async (tx) => {
    for (const [key, value] of entries) {
      await tx
        .insert(settings)
        .values({ key, value, updatedAt: now })
        .onConflictDoUpdate({ target: settings.key, set: { value, updatedAt: now } });
    }
  });
}

/** Whether an id names an observer (for the pilot) and a reference series exists (for the reference). */
export async function checkKSettingsTargets({
  pilotObserverId,
  referenceSeriesId,
}: {
  pilotObserverId: string | null;
  referenceSeriesId: string;
}): Promise<{ pilotExists: boolean; referenceExists: boolean }> {
  const db = getDb();
  const [pilot] = pilotObserverId
    ? await db.select({ id: observers.id }).from(observers).where(eq(observers.id, pilotObserverId)).limit(1)
    : [{ id: "" }];
  const [reference] =
    referenceSeriesId === DEFAULT_K_SETTINGS.referenceSeriesId
      ? [{ id: "" }]
      : await db
          .select({ id: referenceSeries.id })
          .from(referenceSeries)
          .where(eq(referenceSeries.id, referenceSeriesId))
          .limit(1);
  return { pilotExists: Boolean(pilot), referenceExists: Boolean(reference) };
}

// ---------------------------------------------------------------------------
// What a stored k was measured against
// ---------------------------------------------------------------------------

/** Values of k_coefficients.reference written by the full recompute. */
export const K_REFERENCE = {
  network: "network",
  pilot: "network:pilot",
  standIn: "network:stand-in",
  series: (seriesId: string) => `series:${seriesId}`,
} as const;

export function describeKReference({
  reference,
  seriesNames,
}: {
  reference: string;
  seriesNames: Map<string, string>;
}): string {
  if (reference === K_REFERENCE.pilot) return "Network (pilot, held fixed)";
  if (reference === K_REFERENCE.standIn) return "Network (stood in for the pilot)";
  if (reference === K_REFERENCE.network) return "Network";
  if (reference.startsWith("series:"))
    return seriesNames.get(reference.slice(7)) ?? "Reference series (since removed)";
  return reference;
}

async function loadSeriesNames(): Promise<Map<string, string>> {
  const rows = await getDb()
    .select({ id: referenceSeries.id, name: referenceSeries.name })
    .from(referenceSeries);
  return new Map(rows.map((r) => [r.id, r.name]));
}

// ---------------------------------------------------------------------------
// Listings
// ---------------------------------------------------------------------------

export type KHistoryRow = {
  id: string;
  instrumentId: string | null;
  instrumentName: string | null;
  periodStart: string;
  periodEnd: string;
  periodKind: string;
  k: number;
  sigma: number | null;
  commonDays: number;
  method: string;
  reference: string;
  referenceLabel: string;
  computedAt: string;
};

/** One observer's k for every instrument and period, oldest first. */
export async function listKHistory({ observerId }: { observerId: string }): Promise<KHistoryRow[]> {
  const [rows, seriesNames] = await Promise.all([
    getDb()
      .select({
        id: kCoefficients.id,
        instrumentId: kCoefficients.instrumentId,
        instrumentName: instruments.name,
        periodStart: kCoefficients.periodStart,
        periodEnd: kCoefficients.periodEnd,
        periodKind: kCoefficients.periodKind,
        k: kCoefficients.k,
        sigma: kCoefficients.sigma,
        commonDays: kCoefficients.commonDays,
        method: kCoefficients.method,
        reference: kCoefficients.reference,
        computedAt: kCoefficients.computedAt,
      })
      .from(kCoefficients)
      .leftJoin(instruments, eq(instruments.id, kCoefficients.instrumentId))
      .where(eq(kCoefficients.observerId, observerId))
      .orderBy(asc(instruments.name), asc(kCoefficients.periodStart)),
    loadSeriesNames(),
  ]);
  return rows.map((r) => ({
    ...r,
    referenceLabel: describeKReference({ reference: r.reference, seriesNames }),
    computedAt: r.computedAt.toISOString(),
  }));
}

export type ObserverKSummary = {
  observerId: string;
  displayName: string;
  code: string;
  country: string | null;
  instrumentId: string;
  instrumentName: string;
  instrumentKind: string;
  acceptedCounts: number;
  latest: {
    k: number;
    sigma: number | null;
    commonDays: number;
    periodStart: string;
    periodEnd: string;
    reference: string;
  } | null;
  periods: number;
};

/**
 * Every observer–instrument pair that has accepted counts or a k, with its
 * newest k and how many periods have one. Observers without any accepted
 * count yet are left out: there is nothing to reduce.
 */
export async function listObserverKSummaries(): Promise<ObserverKSummary[]> {
  const db = getDb();
  const countOf = await countAcceptedByInstrument();
  const latestRows = await db.$client.execute(`
    SELECT instrument_id AS instrumentId, k, sigma, common_days AS commonDays, period_start AS periodStart,
           period_end AS periodEnd, reference, periods
    FROM (
      SELECT kc.*, row_number() OVER (PARTITION BY instrument_id ORDER BY period_end DESC, created_at DESC) AS position,
             count(*) OVER (PARTITION BY instrument_id) AS periods
      FROM k_coefficients kc WHERE instrument_id IS NOT NULL
    ) WHERE position = 1`);
  const latestOf = new Map(latestRows.rows.map((r) => [String(r.instrumentId), r]));
  const units = await db
    .select({
      observerId: observers.id,
      displayName: observers.displayName,
      code: observers.code,
      country: observers.country,
      instrumentId: instruments.id,
      instrumentName: instruments.name,
      instrumentKind: instruments.kind,
    })
    .from(instruments)
    .innerJoin(observers, eq(observers.id, instruments.observerId))
    .orderBy(asc(observers.displayName), asc(instruments.name));
  return units
    .filter((u) => countOf.has(u.instrumentId) || latestOf.has(u.instrumentId))
    .map((u) => {
      const latest = latestOf.get(u.instrumentId);
      return {
        ...u,
        acceptedCounts: countOf.get(u.instrumentId) ?? 0,
        periods: latest ? Number(latest.periods) : 0,
        latest: latest
          ? {
              k: Number(latest.k),
              sigma: latest.sigma === null ? null : Number(latest.sigma),
              commonDays: Number(latest.commonDays),
              periodStart: String(latest.periodStart),
              periodEnd: String(latest.periodEnd),
              reference: String(latest.reference),
            }
          : null,
      };
    });
}

export type KDriftRow = {
  observerId: string;
  displayName: string;
  code: string;
  instrumentName: string;
  previous: { periodStart: string; periodEnd: string; k: number; sigma: number | null };
  current: { periodStart: string; periodEnd: string; k: number; sigma: number | null };
  relativeChange: number;
  zScore: number | null;
};

/**
 * Drift alerts across the network, newest first: consecutive periods of one
 * observer–instrument pair whose k moved by more than `maxFraction`. The
 * database pairs each k with the one before (a window function) and keeps
 * only large moves, so the page never loads the whole k table.
 */
export async function listKDriftAlerts({
  maxFraction,
  observerId,
  limit = 100,
}: {
  maxFraction: number;
  observerId?: string;
  limit?: number;
}): Promise<KDriftRow[]> {
  const result = await getDb().$client.execute({
    sql: `
      SELECT p.*, ob.display_name AS displayName, ob.code AS code, i.name AS instrumentName
      FROM (
        SELECT observer_id AS observerId, instrument_id AS instrumentId, period_start AS periodStart, period_end AS periodEnd, k, sigma,
               lag(k) OVER w AS previousK, lag(sigma) OVER w AS previousSigma,
               lag(period_start) OVER w AS previousStart, lag(period_end) OVER w AS previousEnd
        FROM k_coefficients
        WHERE instrument_id IS NOT NULL ${observerId ? "AND observer_id = ?" : ""}
        WINDOW w AS (PARTITION BY instrument_id ORDER BY period_start)
      ) p
      JOIN observers ob ON ob.id = p.observerId
      JOIN instruments i ON i.id = p.instrumentId
      WHERE p.previousK IS NOT NULL AND abs(p.k / p.previousK - 1) > ?
      ORDER BY p.periodStart DESC, ob.display_name
      LIMIT ?`,
    args: observerId ? [observerId, maxFraction, limit] : [maxFraction, limit],
  });
  const rows: KDriftRow[] = [];
  for (const r of result.rows) {
    const previous = {
      periodStart: String(r.previousStart),
      periodEnd: String(r.previousEnd),
      k: Number(r.previousK),
      sigma: r.previousSigma === null ? null : Number(r.previousSigma),
    };
    const current = {
      periodStart: String(r.periodStart),
      periodEnd: String(r.periodEnd),
      k: Number(r.k),
      sigma: r.sigma === null ? null : Number(r.sigma),
    };
    const drift = detectKDrift({ previous, current, maxFraction });
    if (!drift.isDrift || drift.relativeChange === null) continue;
    rows.push({
      observerId: String(r.observerId),
      displayName: String(r.displayName),
      code: String(r.code),
      instrumentName: String(r.instrumentName),
      previous,
      current,
      relativeChange: drift.relativeChange,
      zScore: drift.zScore,
    });
  }
  return rows;
}

export async function getObserverSummary({ observerId }: { observerId: string }) {
  const [row] = await getDb()
    .select({
      id: observers.id,
      displayName: observers.displayName,
      code: observers.code,
      country: observers.country,
    })
    .from(observers)
    .where(eq(observers.id, observerId))
    .limit(1);
  return row ?? null;
}

/** Accepted counts per instrument, read from the partial covering index of accepted counts alone. */
async function countAcceptedByInstrument(): Promise<Map<string, number>> {
  const counted = await getDb().$client.execute(
    "SELECT instrument_id AS instrumentId, count(*) AS n FROM observations WHERE status = 'accepted' GROUP BY instrument_id",
  );
  return new Map(counted.rows.map((r) => [String(r.instrumentId), Number(r.n)]));
}

/** Observers with accepted counts, for the pilot and chart pickers, busiest first. */
export async function listObserverChoices(): Promise<
  Array<{ id: string; displayName: string; code: string; acceptedCounts: number }>
> {
  const [countOf, rows] = await Promise.all([
    countAcceptedByInstrument(),
    getDb()
      .select({
        id: observers.id,
        displayName: observers.displayName,
        code: observers.code,
        instrumentId: instruments.id,
      })
      .from(observers)
      .innerJoin(instruments, eq(instruments.observerId, observers.id)),
  ]);
  const byObserver = new Map<
    string,
    { id: string; displayName: string; code: string; acceptedCounts: number }
  >();
  for (const row of rows) {
    const entry = byObserver.get(row.id) ?? {
      id: row.id,
      displayName: row.displayName,
      code: row.code,
      acceptedCounts: 0,
    };
    entry.acceptedCounts += countOf.get(row.instrumentId) ?? 0;
    byObserver.set(row.id, entry);
  }
  return [...byObserver.values()]
    .filter((o) => o.acceptedCounts > 0)
    .sort((a, b) => b.acceptedCounts - a.acceptedCounts || a.displayName.localeCompare(b.displayName));
}

/** When the k coefficients in use were fitted (the latest fit), and how many there are. */
export async function describeStoredK(): Promise<{ count: number; fittedAt: Date | null }> {
  const [row] = await getDb()
    .select({ count: count(), fittedAt: max(kCoefficients.computedAt) })
    .from(kCoefficients);
  return { count: row?.count ?? 0, fittedAt: row?.fittedAt ?? null };
}
