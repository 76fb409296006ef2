import "server-only";

import type { InValue, Transaction } from "@libsql/client";

import { toDayNumber } from "@/lib/counts/series";
import {
  combineObserverCounts,
  computeSmoothedAt,
  SERIES_HEMISPHERES,
  summariseDay,
  summariseMonth,
  summariseYear,
  toMonthIndexOf,
  type DailyRow,
  type Hemisphere,
  type ScaledCount,
} from "@/lib/series/network-series";
import { describeMonthDays, formatMonth } from "@/lib/series/periods";

import { getDb, inWriteTransaction, lookupFirstRow } from "../client";

// ---------------------------------------------------------------------------
// Shared SQL
// ---------------------------------------------------------------------------

/**
 * The k that scales one accepted count `o`, by the rule every path shares
 * (lib/series/k-fit.ts buildKLookup): the k of its observer and instrument
 * for the period holding the day; else the observer's k for that period kept
 * without an instrument; else the newest k of the instrument, else of the
 * observer; else 1.0. Each branch is one seek in k_observer_period_idx.
 */
export const K_FOR_OBSERVATION_SQL = `COALESCE(
  (SELECT kc.k FROM k_coefficients kc WHERE kc.observer_id = o.observer_id AND kc.instrument_id = o.instrument_id
     AND kc.period_end >= o.ut_date AND kc.period_start <= o.ut_date ORDER BY kc.period_end, kc.created_at DESC LIMIT 1),
  (SELECT kc.k FROM k_coefficients kc WHERE kc.observer_id = o.observer_id AND kc.instrument_id IS NULL
     AND kc.period_end >= o.ut_date AND kc.period_start <= o.ut_date ORDER BY kc.period_end, kc.created_at DESC LIMIT 1),
  (SELECT kc.k FROM k_coefficients kc WHERE kc.observer_id = o.observer_id AND kc.instrument_id = o.instrument_id
     ORDER BY kc.period_end DESC, kc.created_at DESC LIMIT 1),
  (SELECT kc.k FROM k_coefficients kc WHERE kc.observer_id = o.observer_id AND kc.instrument_id IS NULL
     ORDER BY kc.period_end DESC, kc.created_at DESC LIMIT 1),
  1.0)`;

const hintCache = globalThis as unknown as {
  __heliotallyIndexHints?: WeakMap<object, Map<string, string>>;
};

/**
 * "INDEXED BY <index>" once that index exists. Without table statistics
 * SQLite prefers the status index and then sorts a million rows; the
 * covering indexes of accepted counts are already in the order wanted
 * (measured in tests/bench/series.bench.ts). A database whose server started
 * before the migration that adds an index simply runs without the hint.
 */
async function indexHint(name: string): Promise<string> {
  const client = getDb().$client;
  const cache = (hintCache.__heliotallyIndexHints ??= new WeakMap());
  let known = cache.get(client);
  if (!known) cache.set(client, (known = new Map()));
  const hint = known.get(name);
  if (hint !== undefined) return hint;
  const found = await client.execute({
    sql: "SELECT 1 FROM sqlite_master WHERE type = 'index' AND name = ?",
    args: [name],
  });
  const made = found.rows.length > 0 ? `INDEXED BY ${name}` : "";
  known.set(name, made);
  return made;
}

/** Accepted counts in day order: refreshing one day is a single range seek. */
export const acceptedDayIndexHint = () => indexHint("observations_accepted_day_idx");
/** Accepted counts instrument by instrument, each packed into one integer: the full recompute's read. */
export const acceptedPackedIndexHint = () => indexHint("observations_accepted_packed_idx");

const REVISION_KEY = "series.revision";

/** Raised by every write to the series; caches of series pages are keyed by it. */
export function bumpSeriesRevisionStatement(): { sql: string; args: InValue[] } {
  return {
    // settings.updatedAt is stored in the created_at column (db/schema.ts).
    sql: `INSERT INTO settings (key, value, created_at) VALUES (?, '1', unixepoch('subsec') * 1000)
          ON CONFLICT (key) DO UPDATE SET value = CAST(CAST(value AS INTEGER) + 1 AS TEXT), created_at = excluded.created_at`,
    args: [REVISION_KEY],
  };
}

/** Read on every Archive page request (db/queries/series-cache.ts). */
export async function getSeriesRevision(): Promise<number> {
  const row = await lookupFirstRow(getDb(), "SELECT value FROM settings WHERE key = ?", [REVISION_KEY]);
  const value = row?.[0];
  return value === undefined || value === null ? 0 : Number(value);
}

// ---------------------------------------------------------------------------
// Incremental refresh
// ---------------------------------------------------------------------------

type RecomputeWatch = { dirtyDays: Set<string> };
const watch = globalThis as unknown as { __heliotallyRecomputeWatch?: RecomputeWatch | null };

/**
 * While a full recompute computes from its snapshot, remember which days were
 * refreshed meanwhile, so it can refresh them again after writing its result.
 */
export function watchDirtyDays(): { stop: () => string[] } {
  const current: RecomputeWatch = { dirtyDays: new Set() };
  watch.__heliotallyRecomputeWatch = current;
  return {
    stop: () => {
      if (watch.__heliotallyRecomputeWatch === current) watch.__heliotallyRecomputeWatch = null;
      return [...current.dirtyDays].sort();
    },
  };
}

function isUtDay(day: string): boolean {
  if (typeof day !== "string" || !/^\d{4}-\d{2}-\d{2}$/.test(day)) return false;
  try {
    toDayNumber(day);
    return true;
  } catch {
    return false;
  }
}

const CHUNK = 400;

/**
 * Recomputes the stored network series for the given UT days after accepted
 * counts changed (a review decision, a correction): the daily rows of those
 * days (whole disk, north, south) from the day's accepted counts, each scaled
 * by its observer's k for that period; then the months they fall in (mean
 * over days with data), the 13-month smoothed values of every month within
 * six months of them, and their years. Every read is an indexed lookup, so
 * the cost does not grow with the archive. One transaction: readers see the
 * series before or after, never half-way.
 */
export async function refreshSeriesForDays({ days }: { days: string[] }): Promise<void> {
  const wanted = [...new Set(days)].filter(isUtDay).sort();
  if (wanted.length === 0) return;
  for (const day of wanted) watch.__heliotallyRecomputeWatch?.dirtyDays.add(day);

  const hint = await acceptedDayIndexHint();
  await inWriteTransaction(getDb(), async (tx) => {
    const daily: DailyRow[] = [];
    for (let start = 0; start < wanted.length; start += CHUNK) {
      const chunk = wanted.slice(start, start + CHUNK);
      const result = await tx.execute({
        sql: `SELECT o.ut_date AS day, o.observer_id AS observerId, 10 * o.groups + o.spots AS raw,
                CASE WHEN o.north_groups IS NULL OR o.north_spots IS NULL OR o.south_groups IS NULL OR o.south_spots IS NULL
                     THEN NULL ELSE 10 * o.north_groups + o.north_spots END AS northRaw,
                CASE WHEN o.north_groups IS NULL OR o.north_spots IS NULL OR o.south_groups IS NULL OR o.south_spots IS NULL
                     THEN NULL ELSE 10 * o.south_groups + o.south_spots END AS southRaw,
                ${K_FOR_OBSERVATION_SQL} AS k
              FROM observations o ${hint}
              WHERE o.status = 'accepted' AND o.ut_date IN (${chunk.map(() => "?").join(",")})
              ORDER BY o.ut_date, o.instrument_id, o.groups, o.spots, o.north_groups, o.north_spots, o.south_groups, o.south_spots`,
        args: chunk,
      });
      const byDay = new Map<string, ScaledCount[]>();
      for (const row of result.rows) {
        const day = String(row.day);
        const list = byDay.get(day) ?? [];
        list.push({
          observerKey: String(row.observerId),
          k: Number(row.k),
          raw: Number(row.raw),
          northRaw: row.northRaw === null ? null : Number(row.northRaw),
          southRaw: row.southRaw === null ? null : Number(row.southRaw),
        });
        byDay.set(day, list);
      }
      for (const [day, counts] of byDay)
        daily.push(...summariseDay({ day, values: combineObserverCounts(counts) }));
      await tx.execute({
        sql: `DELETE FROM series_daily WHERE day IN (${chunk.map(() => "?").join(",")})`,
        args: chunk,
      });
    }
    await insertRows({ tx, table: "series_daily", columns: DAILY_COLUMNS, rows: daily.map(dailyValues) });

    const months = [...new Set(wanted.map(toMonthIndexOf))].sort((a, b) => a - b);
    const changed = await refreshMonths({ tx, months });
    await refreshSmoothed({ tx, changed });
    await refreshYears({ tx, changed });
    await tx.execute(bumpSeriesRevisionStatement());
  });
}

const HEMISPHERE_LIST = `('all', 'N', 'S')`;

/**
 * Rebuilds the monthly rows of the given months from their daily rows and
 * returns which (hemisphere, month) actually changed: accepting a count
 * without a north/south split leaves the hemispheric months as they were,
 * and their smoothed values and years need no work.
 */
async function refreshMonths({
  tx,
  months,
}: {
  tx: Transaction;
  months: number[];
}): Promise<Array<{ hemisphere: Hemisphere; monthIndex: number }>> {
  const changed: Array<{ hemisphere: Hemisphere; monthIndex: number }> = [];
  for (const monthIndex of months) {
    const month = formatMonth(monthIndex);
    const { first, last } = describeMonthDays(monthIndex);
    const [daysResult, storedResult] = await Promise.all([
      tx.execute({
        sql: `SELECT hemisphere, mean FROM series_daily WHERE hemisphere IN ${HEMISPHERE_LIST} AND day BETWEEN ? AND ? ORDER BY hemisphere, day`,
        args: [first, last],
      }),
      tx.execute({
        sql: `SELECT hemisphere, days, mean FROM series_monthly WHERE hemisphere IN ${HEMISPHERE_LIST} AND month = ?`,
        args: [month],
      }),
    ]);
    const meansOf = new Map<Hemisphere, number[]>(SERIES_HEMISPHERES.map((h) => [h, []]));
    for (const row of daysResult.rows)
      meansOf.get(String(row.hemisphere) as Hemisphere)?.push(Number(row.mean));
    for (const hemisphere of SERIES_HEMISPHERES) {
      const stored = storedResult.rows.find((r) => r.hemisphere === hemisphere);
      const row = summariseMonth({ month, hemisphere, dailyMeans: meansOf.get(hemisphere) ?? [] });
      if (!row) {
        if (!stored) continue;
        await tx.execute({
          sql: "DELETE FROM series_monthly WHERE hemisphere = ? AND month = ?",
          args: [hemisphere, month],
        });
      } else {
        if (stored && Number(stored.days) === row.days && Number(stored.mean) === row.mean) continue;
        // Upsert keeps the stored smoothed value until refreshSmoothed rewrites it.
        await tx.execute({
          sql: `INSERT INTO series_monthly (month, hemisphere, days, sum_of_daily_means, mean, smoothed) VALUES (?, ?, ?, ?, ?, NULL)
                ON CONFLICT (hemisphere, month) DO UPDATE SET days = excluded.days, sum_of_daily_means = excluded.sum_of_daily_means,
                  mean = excluded.mean, created_at = excluded.created_at`,
          args: [row.month, row.hemisphere, row.days, row.sumOfDailyMeans, row.mean],
        });
      }
      changed.push({ hemisphere, monthIndex });
    }
  }
  return changed;
}

/** Smoothed values of every month whose 13-month window holds a changed month, per hemisphere. */
async function refreshSmoothed({
  tx,
  changed,
}: {
  tx: Transaction;
  changed: Array<{ hemisphere: Hemisphere; monthIndex: number }>;
}): Promise<void> {
  for (const hemisphere of SERIES_HEMISPHERES) {
    const months = changed.filter((c) => c.hemisphere === hemisphere).map((c) => c.monthIndex);
    if (months.length === 0) continue;
    const targets = new Set<number>();
    for (const m of months) for (let offset = -6; offset <= 6; offset++) targets.add(m + offset);
    const first = Math.min(...targets) - 6;
    const last = Math.max(...targets) + 6;
    const result = await tx.execute({
      sql: "SELECT month, mean, smoothed FROM series_monthly WHERE hemisphere = ? AND month BETWEEN ? AND ?",
      args: [hemisphere, formatMonth(first), formatMonth(last)],
    });
    const meanOf = new Map<number, number>();
    const smoothedOf = new Map<number, number | null>();
    for (const row of result.rows) {
      const index = toMonthIndexOf(String(row.month));
      meanOf.set(index, Number(row.mean));
      smoothedOf.set(index, row.smoothed === null ? null : Number(row.smoothed));
    }
    for (const monthIndex of [...targets].sort((a, b) => a - b)) {
      if (!meanOf.has(monthIndex)) continue;
      const smoothed = computeSmoothedAt({ monthIndex, meanOfMonth: (m) => meanOf.get(m) });
      if (smoothed === smoothedOf.get(monthIndex)) continue;
      await tx.execute({
        sql: "UPDATE series_monthly SET smoothed = ? WHERE hemisphere = ? AND month = ?",
        args: [smoothed, hemisphere, formatMonth(monthIndex)],
      });
    }
  }
}

async function refreshYears({
  tx,
  changed,
}: {
  tx: Transaction;
  changed: Array<{ hemisphere: Hemisphere; monthIndex: number }>;
}): Promise<void> {
  const keys = new Set(changed.map((c) => `${c.hemisphere}|${Math.floor(c.monthIndex / 12)}`));
  for (const key of keys) {
    const [hemisphere, yearText] = key.split("|") as [Hemisphere, string];
    const year = Number(yearText);
    const padded = String(year).padStart(4, "0");
    const result = await tx.execute({
      sql: "SELECT days, sum_of_daily_means AS sum FROM series_monthly WHERE hemisphere = ? AND month BETWEEN ? AND ?",
      args: [hemisphere, `${padded}-01`, `${padded}-12`],
    });
    const row = summariseYear({
      year,
      hemisphere,
      months: result.rows.map((r) => ({ days: Number(r.days), sumOfDailyMeans: Number(r.sum) })),
    });
    if (!row) {
      await tx.execute({
        sql: "DELETE FROM series_yearly WHERE hemisphere = ? AND year = ?",
        args: [hemisphere, year],
      });
      continue;
    }
    await tx.execute({
      sql: `INSERT INTO series_yearly (year, hemisphere, days, mean) VALUES (?, ?, ?, ?)
            ON CONFLICT (hemisphere, year) DO UPDATE SET days = excluded.days, mean = excluded.mean, created_at = excluded.created_at`,
      args: [row.year, row.hemisphere, row.days, row.mean],
    });
  }
}

// ---------------------------------------------------------------------------
// Bulk writes (full recompute)
// ---------------------------------------------------------------------------

export const DAILY_COLUMNS = ["day", "hemisphere", "observers", "sum", "sum_squares", "mean", "sd"] as const;

export function dailyValues(row: DailyRow): InValue[] {
  return [row.day, row.hemisphere, row.observers, row.sum, row.sumSquares, row.mean, row.sd];
}

/**
 * Multi-row INSERTs of at most ~8,000 bound values each (SQLite's limit is
 * 32,766); one statement per chunk instead of one per row is what makes
 * writing tens of thousands of rows take milliseconds.
 */
export async function insertRows({
  tx,
  table,
  columns,
  rows,
}: {
  tx: Pick<Transaction, "execute">;
  table: string;
  columns: readonly string[];
  rows: ReadonlyArray<ReadonlyArray<unknown>>;
}): Promise<void> {
  if (rows.length === 0) return;
  const perStatement = Math.max(1, Math.floor(8000 / columns.length));
  const tuple = `(${columns.map(() => "?").join(",")})`;
  for (let start = 0; start < rows.length; start += perStatement) {
    const chunk = rows.slice(start, start + perStatement);
    const args: Array<string | number | null> = [];
    for (const row of chunk) for (const value of row) args.push(value as string | number | null);
    await tx.execute({
      sql: `INSERT INTO ${table} (${columns.join(",")}) VALUES ${chunk.map(() => tuple).join(",")}`,
      args,
    });
  }
}
