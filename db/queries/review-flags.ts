import "server-only";

import type { ResultSet } from "@libsql/client";
import { and, desc, eq, inArray, ne } from "drizzle-orm";
import type { BaseSQLiteDatabase } from "drizzle-orm/sqlite-core";

import { computeRawCount } from "@/lib/counts/relative-number";
import {
  computeAutomaticFlags,
  DEFAULT_OUTLIER_THRESHOLD,
  OUTLIER_THRESHOLD_SETTING,
} from "@/lib/review/flags";

import { getDb } from "../client";
import * as schema from "../schema";
import { kCoefficients, observationFlags, observations, settings } from "../schema";

/** The database or a transaction on it: both build the same queries. */
export type Executor = BaseSQLiteDatabase<"async", ResultSet, typeof schema>;

/** SQLite caps bound parameters per statement; stay far below the cap. */
const ID_CHUNK = 400;
/** How much of an observer's accepted history judges their usual s/g (about a year of clear days). */
const HISTORY_DAYS = 365;

function chunk<T>(items: readonly T[], size = ID_CHUNK): T[][] {
  const out: T[][] = [];
  for (let i = 0; i < items.length; i += size) out.push(items.slice(i, i + size));
  return out;
}

export async function getOutlierThreshold({ db = getDb() }: { db?: Executor } = {}): Promise<number> {
  const [row] = await db
    .select({ value: settings.value })
    .from(settings)
    .where(eq(settings.key, OUTLIER_THRESHOLD_SETTING));
  return typeof row?.value === "number" && Number.isFinite(row.value) ? row.value : DEFAULT_OUTLIER_THRESHOLD;
}

export async function setOutlierThreshold({
  value,
  db = getDb(),
}: {
  value: number;
  db?: Executor;
}): Promise<void> {
  await db
    .insert(settings)
    .values({ key: OUTLIER_THRESHOLD_SETTING, value, updatedAt: new Date() })
    .onConflictDoUpdate({ target: settings.key, set: { value, updatedAt: new Date() } });
}

/**
 * Current k for many observers at once, by the same rule as getCurrentKs in
 * ./observers: the newest coefficient for the instrument, else the newest for
 * the observer as a whole, else 1.0.
 */
export async function loadCurrentKs({
  observerIds,
  db = getDb(),
}: {
  observerIds: readonly string[];
  db?: Executor;
}) {
  const byInstrument = new Map<string, number>();
  const overall = new Map<string, number>();
  for (const ids of chunk([...new Set(observerIds)])) {
    const rows = await db
      .select({
        observerId: kCoefficients.observerId,
        instrumentId: kCoefficients.instrumentId,
        k: kCoefficients.k,
      })
      .from(kCoefficients)
      .where(inArray(kCoefficients.observerId, ids))
      .orderBy(desc(kCoefficients.periodEnd), desc(kCoefficients.computedAt));
    for (const row of rows) {
      if (row.instrumentId === null) {
        if (!overall.has(row.observerId)) overall.set(row.observerId, row.k);
      } else if (!byInstrument.has(row.instrumentId)) {
        byInstrument.set(row.instrumentId, row.k);
      }
    }
  }
  return ({ observerId, instrumentId }: { observerId: string; instrumentId: string }): number =>
    byInstrument.get(instrumentId) ?? overall.get(observerId) ?? 1;
}

type DayRow = {
  id: string;
  observerId: string;
  instrumentId: string;
  utDate: string;
  observedAt: Date;
  status: schema.ObservationStatus;
  groups: number;
  spots: number;
};

/** Every non-rejected count on the given UT days: the day's network and possible duplicates. */
export async function listCountsOnDays({
  days,
  db = getDb(),
}: {
  days: readonly string[];
  db?: Executor;
}): Promise<DayRow[]> {
  const out: DayRow[] = [];
  for (const part of chunk([...new Set(days)])) {
    out.push(
      ...(await db
        .select({
          id: observations.id,
          observerId: observations.observerId,
          instrumentId: observations.instrumentId,
          utDate: observations.utDate,
          observedAt: observations.observedAt,
          status: observations.status,
          groups: observations.groups,
          spots: observations.spots,
        })
        .from(observations)
        .where(and(inArray(observations.utDate, part), ne(observations.status, "rejected")))),
    );
  }
  return out;
}

/** Counts that make up a day's network value: accepted ones and those waiting for review. */
export function isNetworkCount(row: { status: schema.ObservationStatus }): boolean {
  return row.status === "accepted" || row.status === "submitted";
}

/**
 * Recomputes the automatic flags of the given observations and replaces
 * their stored flags. Pass a transaction as `db` so the flags change together
 * with whatever caused them; it runs its own queries only through `db`.
 */
export async function refreshAutomaticFlags({
  observationIds,
  db,
  withWaitingSiblings = false,
}: {
  observationIds: readonly string[];
  db: Executor;
  /**
   * Also re-check the same observer's other waiting counts with the same
   * instrument that UT day: when a second count arrives, the first becomes
   * half of a pair too and should say so.
   */
  withWaitingSiblings?: boolean;
}): Promise<Map<string, ReturnType<typeof computeAutomaticFlags>>> {
  const result = new Map<string, ReturnType<typeof computeAutomaticFlags>>();
  const ids = [...new Set(observationIds)];
  if (ids.length === 0) return result;

  const candidates = [];
  for (const part of chunk(ids)) {
    candidates.push(...(await db.select().from(observations).where(inArray(observations.id, part))));
  }
  const dayRows = await listCountsOnDays({ days: candidates.map((c) => c.utDate), db });
  if (withWaitingSiblings) {
    const pairs = new Set(candidates.map((c) => `${c.observerId}|${c.instrumentId}|${c.utDate}`));
    const siblingIds = dayRows
      .filter((r) => !ids.includes(r.id) && (r.status === "submitted" || r.status === "queried"))
      .filter((r) => pairs.has(`${r.observerId}|${r.instrumentId}|${r.utDate}`))
      .map((r) => r.id);
    if (siblingIds.length > 0) {
      ids.push(...siblingIds);
      candidates.push(...(await db.select().from(observations).where(inArray(observations.id, siblingIds))));
    }
  }
  const kOf = await loadCurrentKs({ observerIds: [...dayRows, ...candidates].map((r) => r.observerId), db });
  const threshold = await getOutlierThreshold({ db });

  const byDay = new Map<string, DayRow[]>();
  for (const row of dayRows) byDay.set(row.utDate, [...(byDay.get(row.utDate) ?? []), row]);

  const histories = new Map<string, Array<{ groups: number; spots: number }>>();
  for (const candidate of candidates) {
    const pair = `${candidate.observerId}|${candidate.instrumentId}`;
    if (!histories.has(pair)) {
      histories.set(
        pair,
        await db
          .select({ groups: observations.groups, spots: observations.spots })
          .from(observations)
          .where(
            and(
              eq(observations.observerId, candidate.observerId),
              eq(observations.instrumentId, candidate.instrumentId),
              eq(observations.status, "accepted"),
            ),
          )
          .orderBy(desc(observations.utDate))
          .limit(HISTORY_DAYS),
      );
    }
    const sameDay = (byDay.get(candidate.utDate) ?? []).filter((r) => r.id !== candidate.id);
    // The network is everybody else: the observer's own other counts that day
    // would otherwise vouch for a duplicated mistake.
    const otherScaledValues = sameDay
      .filter((r) => r.observerId !== candidate.observerId && isNetworkCount(r))
      .map((r) => kOf(r) * computeRawCount(r));
    const siblings = sameDay.filter(
      (r) => r.observerId === candidate.observerId && r.instrumentId === candidate.instrumentId,
    );
    result.set(
      candidate.id,
      computeAutomaticFlags({
        ...candidate,
        k: kOf(candidate),
        otherScaledValues,
        history: histories.get(pair) ?? [],
        siblings,
        threshold,
      }),
    );
  }

  for (const part of chunk(ids)) {
    await db.delete(observationFlags).where(inArray(observationFlags.observationId, part));
  }
  const rows = [...result].flatMap(([observationId, flags]) => flags.map((f) => ({ observationId, ...f })));
  for (const part of chunk(rows, 100)) await db.insert(observationFlags).values(part);
  return result;
}

/** Ids of every observation waiting on the coordinator (submitted or queried). */
export async function listAwaitingObservationIds({ db = getDb() }: { db?: Executor } = {}): Promise<
  string[]
> {
  const rows = await db
    .select({ id: observations.id })
    .from(observations)
    .where(inArray(observations.status, ["submitted", "queried"]));
  return rows.map((r) => r.id);
}

/**
 * Flags every observation waiting for review. The demo seed calls this so the
 * planted outliers arrive on the Review desk already flagged, exactly as
 * they would have been had they been logged one by one.
 */
export async function flagAwaitingReview({ db = getDb() }: { db?: Executor } = {}): Promise<number> {
  const ids = await listAwaitingObservationIds({ db });
  await db.transaction(async (tx) => {
    await refreshAutomaticFlags({ observationIds: ids, db: tx });
  });
  return ids.length;
}
