import "server-only";

import { formatDayNumber } from "@/lib/counts/series";
import { makeOrderedIdMaker } from "@/lib/ids/ordered-ids";
import { countsFromPacks, sliceByKey, type AcceptedCounts } from "@/lib/series/accepted-counts";
import { packsFromPackedText, type CountPack } from "@/lib/series/count-packs";
import { fitAllPeriods, type KFitReference } from "@/lib/series/k-fit-helper";
import { buildKLookup, buildStoredKResolver, type KFit, type KUnit } from "@/lib/series/k-fit";
import {
  appendDailyRows,
  seriesFromDaily,
  SERIES_HEMISPHERES,
  type DailyRow,
  type Hemisphere,
} from "@/lib/series/network-series";
import { describePeriod, findPeriodIndex } from "@/lib/series/periods";
import { PACKED_COUNT_SQL } from "@/lib/series/packed-count";
import { NETWORK_REFERENCE, type KSettings } from "@/lib/validation/k-settings";

import { writeAllOrNothing, type WriteStep } from "../bulk-write";
import { getDb } from "../client";
import { countPackWrites, readTrustedPacks } from "./count-packs";
import { createJob, findActiveJob, finishJob, markJobRunning, reportJobProgress, type JobView } from "./jobs";
import { flagAwaitingReview } from "./review-flags";
import { getKSettings, K_REFERENCE } from "./k";
import { getReferenceSeries, loadReferenceValues } from "./reference-series";
import {
  acceptedPackedIndexHint,
  bumpSeriesRevisionStatement,
  DAILY_COLUMNS,
  dailyValues,
  refreshSeriesForDays,
  watchDirtyDays,
} from "./series";

export const RECOMPUTE_JOB_KIND = "series-recompute";

/** Days of daily rows the recompute builds between two turns for other requests (about 3 years). */
const DAYS_PER_SERIES_SLICE = 1_024;

/** Instruments read per batch by the recompute (about 3,000 counts each in a large archive). */
const READ_BATCH_INSTRUMENTS = 40;

/**
 * One row for a batch of instruments: their ids, their numbers of accepted
 * counts, and all their packed counts in one string, in the same order.
 * One big string per batch rather than one per instrument: strings of a few
 * dozen kilobytes are made in V8's young generation and copied by every
 * collection until they are promoted, which cost more than reading them.
 */
export function packedBatchSql({ hint, instruments }: { hint: string; instruments: number }): string {
  return `SELECT group_concat(instrumentId, ',') AS ids, group_concat(n, ',') AS counts,
                 group_concat(packed, '') AS packed
          FROM (SELECT instrument_id AS instrumentId, count(*) AS n,
                       group_concat(${PACKED_COUNT_SQL}, '') AS packed
                FROM observations ${hint}
                WHERE status = 'accepted' AND instrument_id IN (${Array.from({ length: instruments }, () => "?").join(", ")})
                GROUP BY instrument_id
                ORDER BY instrument_id)`;
}

export type Units = { units: KUnit[]; observerOfUnit: Int32Array; labelOf: (unit: number) => string };

/**
 * Every accepted count, in day order, as typed arrays, with the writes that
 * keep the count packs current (to be made in the recompute's write
 * transaction). Units are instruments, each belonging to one observer.
 *
 * Most instruments' counts come from their stored pack, one blob each
 * (db/queries/count-packs.ts). Instruments whose counts changed since, or
 * that have no readable pack, are read from the observations: each count as
 * one integer kept in an index (lib/series/packed-count.ts), never touching
 * the table, a few dozen instruments per row of one long string (see
 * packedBatchSql); their packs are then written anew. One read transaction
 * keeps the instruments, packs, changes and counts on one snapshot.
 */
export async function loadAcceptedCounts(): Promise<
  { counts: AcceptedCounts; countOfUnit: Int32Array; packWrites: WriteStep[] } & Units
> {
  const client = getDb().$client;
  const units: KUnit[] = [];
  const labels: string[] = [];
  const unitOfInstrument = new Map<string, number>();
  const observerIndex = new Map<string, number>();
  const observerOfUnitList: number[] = [];
  const packOfUnit: Array<CountPack | null> = [];
  const rebuilt: Array<{ instrumentId: string; count: number; bytes: Uint8Array }> = [];
  const dropped: string[] = [];
  let changesUpTo: number | null = null;
  const hint = await acceptedPackedIndexHint();
  const reader = await client.transaction("read");
  try {
    const instrumentRows = await reader.execute(
      `SELECT i.id AS instrumentId, i.observer_id AS observerId, i.name AS instrumentName,
              ob.display_name AS displayName, ob.code AS code
       FROM instruments i JOIN observers ob ON ob.id = i.observer_id ORDER BY i.rowid`,
    );
    for (const row of instrumentRows.rows) {
      const observerId = String(row.observerId);
      unitOfInstrument.set(String(row.instrumentId), units.length);
      units.push({ observerId, instrumentId: String(row.instrumentId) });
      labels.push(`${String(row.displayName)} (${String(row.code)}, ${String(row.instrumentName)})`);
      if (!observerIndex.has(observerId)) observerIndex.set(observerId, observerIndex.size);
      observerOfUnitList.push(observerIndex.get(observerId)!);
      packOfUnit.push(null);
    }
    const trusted = await readTrustedPacks(reader);
    changesUpTo = trusted.changesUpTo;
    await yieldToServer();
    const toRead: string[] = [];
    for (const [instrumentId, unit] of unitOfInstrument) {
      const pack = trusted.packs.get(instrumentId);
      if (pack) packOfUnit[unit] = pack;
      else toRead.push(instrumentId);
    }
    // Packs of instruments deleted since (they had no counts left) go.
    for (const instrumentId of trusted.storedFor)
      if (!unitOfInstrument.has(instrumentId)) dropped.push(instrumentId);

    // A few dozen instruments at a time, each an index seek, giving the
    // server's other requests a turn in between.
    toRead.sort();
    for (let start = 0; start < toRead.length; start += READ_BATCH_INSTRUMENTS) {
      const batch = toRead.slice(start, start + READ_BATCH_INSTRUMENTS);
      const result = await reader.execute({
        sql: packedBatchSql({ hint, instruments: batch.length }),
        args: batch,
      });
      const row = result.rows[0];
      const made = new Map<string, { pack: CountPack; bytes: Uint8Array }>();
      if (row?.ids != null) {
        const ids = String(row.ids).split(",");
        const counts = String(row.counts).split(",").map(Number);
        if (ids.length !== counts.length)
          throw new RangeError(`Read ${ids.length} instruments but ${counts.length} numbers of counts`);
        const packs = packsFromPackedText(String(row.packed ?? ""), counts);
        ids.forEach((instrumentId, i) => made.set(instrumentId, packs[i]!));
      }
      // Instruments without accepted counts get an empty pack, so they are not read again.
      for (const instrumentId of batch) {
        const { pack, bytes } = made.get(instrumentId) ?? { pack: null, bytes: new Uint8Array(0) };
        packOfUnit[unitOfInstrument.get(instrumentId)!] = pack;
        rebuilt.push({ instrumentId, count: pack?.count ?? 0, bytes });
      }
      await yieldToServer();
    }
  } finally {
    reader.close();
  }
  await yieldToServer();
  const withCounts: Array<{ unit: number; pack: CountPack }> = [];
  const countOfUnit = new Int32Array(units.length);
  packOfUnit.forEach((pack, unit) => {
    if (pack) withCounts.push({ unit, pack });
    countOfUnit[unit] = pack?.count ?? 0;
  });
  return {
    counts: countsFromPacks(withCounts),
    countOfUnit,
    packWrites: countPackWrites({ rebuilt, dropped, changesUpTo }),
    units,
    observerOfUnit: Int32Array.from(observerOfUnitList),
    labelOf: (unit) => labels[unit] ?? `unit ${unit}`,
  };
}

export type RecomputeSummary = {
  observations: number;
  units: number;
  periods: number;
  kCoefficients: number;
  days: number;
  months: number;
  notes: string[];
  timingsMs: Record<string, number>;
  /** Threads the k fit ran on (1 until the helper thread is ready, or without it). */
  kFitThreads: 1 | 2;
};

type Progress = (fraction: number, message: string) => Promise<void> | void;

/** The observer with the most accepted counts: the pilot when none is chosen. */
function findBusiestObserver({
  countOfUnit,
  units,
}: {
  countOfUnit: Int32Array;
  units: KUnit[];
}): string | null {
  const perObserver = new Map<string, number>();
  units.forEach((u, i) =>
    perObserver.set(u.observerId, (perObserver.get(u.observerId) ?? 0) + (countOfUnit[i] as number)),
  );
  let best: string | null = null;
  let bestCount = 0;
  for (const [observerId, n] of perObserver) {
    if (n > bestCount || (n === bestCount && best !== null && observerId < best)) {
      best = observerId;
      bestCount = n;
    }
  }
  return best;
}

const yieldToServer = () => new Promise<void>((resolve) => setImmediate(resolve));

/**
 * Series rows (in date order) in the order of their tables' key, hemisphere
 * then date, comparing as SQLite does ("N" < "S" < "all"): the key's index
 * then grows at its end instead of at three places. That made writing the
 * 27,000 daily rows of a million counts about a third faster.
 */
function inKeyOrder<Row extends { hemisphere: Hemisphere }>(rows: readonly Row[]): Row[] {
  return [...SERIES_HEMISPHERES]
    .sort()
    .flatMap((hemisphere) => rows.filter((row) => row.hemisphere === hemisphere));
}

/**
 * Recomputes every k and the whole stored series from the accepted counts,
 * with the coordinator's settings. Everything is computed in memory from one
 * consistent read; the result replaces the k and series tables in one short
 * write transaction, so readers see the old series until the new one is
 * complete. Days refreshed incrementally meanwhile are refreshed again after
 * the write, so no review decision taken during the run is lost.
 */
export async function runFullRecompute({
  onProgress = () => undefined,
  settings: given,
  refitK = true,
  threads = 2,
}: {
  onProgress?: Progress;
  settings?: KSettings;
  /** false: keep the stored k coefficients and rebuild only the series from them. */
  refitK?: boolean;
  /** 2: fit the periods on this thread and the k-fit helper thread (lib/series/k-fit-helper.ts) once it is ready. */
  threads?: 1 | 2;
} = {}): Promise<RecomputeSummary> {
  const timingsMs: Record<string, number> = {};
  let mark = performance.now();
  const lap = (label: string) => {
    const now = performance.now();
    timingsMs[label] = Math.round((now - mark) * 10) / 10;
    mark = now;
  };
  const dirty = watchDirtyDays();
  try {
    const settings = given ?? (await getKSettings());
    await onProgress(0.02, "Reading accepted counts");
    const { counts, countOfUnit, packWrites, units, observerOfUnit, labelOf } = await loadAcceptedCounts();
    lap("read");

    const notes: string[] = [];
    const fitted = refitK
      ? await fitAllK({ counts, countOfUnit, units, labelOf, settings, notes, onProgress, threads })
      : {
          fits: [] as KFit[],
          kOfRow: await resolveStoredK({ counts, units }),
          periods: 0,
          referenceLabel: () => "",
          threads: 1 as const,
        };
    lap("k");

    // The daily rows a few years at a time (about 70 ms in all on a million
    // counts), giving the server's other requests a turn in between.
    await onProgress(0.78, "Building the daily, monthly and yearly series");
    const daily: DailyRow[] = [];
    for (const { from, to } of sliceByKey({
      counts,
      keyOf: (day) => Math.floor(day / DAYS_PER_SERIES_SLICE),
    })) {
      await yieldToServer();
      appendDailyRows({ counts, kOfRow: fitted.kOfRow, observerOfUnit, from, to, daily });
    }
    await yieldToServer();
    const series = seriesFromDaily(daily);
    lap("series");

    await yieldToServer();
    await onProgress(0.88, "Writing the new series");
    const makeId = makeOrderedIdMaker({ startMs: Date.now() });
    // In the order of the observer–period index (and ordered ids for the
    // key): each index then grows at its end instead of all over its pages,
    // which measured about a quarter faster for 5,000 coefficients.
    const observerOf = (fit: KFit) => units[fit.unit]!.observerId;
    const kInIndexOrder = [...fitted.fits].sort((a, b) =>
      observerOf(a) < observerOf(b) ? -1 : observerOf(a) > observerOf(b) ? 1 : a.periodIndex - b.periodIndex,
    );
    const kRows = kInIndexOrder.map((fit, position) => {
      const period = describePeriod({ index: fit.periodIndex, kind: settings.periodKind });
      const unit = units[fit.unit]!;
      return [
        makeId(position),
        unit.observerId,
        unit.instrumentId,
        period.start,
        period.end,
        fit.k,
        fit.sigma,
        fit.commonDays,
        settings.method,
        settings.periodKind,
        fitted.referenceLabel(fit.role),
      ];
    });
    await writeAllOrNothing(getDb(), [
      ...(refitK
        ? [
            { sql: "DELETE FROM k_coefficients" },
            {
              table: "k_coefficients",
              columns: [
                "id",
                "observer_id",
                "instrument_id",
                "period_start",
                "period_end",
                "k",
                "sigma",
                "common_days",
                "method",
                "period_kind",
                "reference",
              ],
              rows: kRows,
            },
          ]
        : []),
      { sql: "DELETE FROM series_daily" },
      { table: "series_daily", columns: DAILY_COLUMNS, rows: inKeyOrder(series.daily).map(dailyValues) },
      { sql: "DELETE FROM series_monthly" },
      {
        table: "series_monthly",
        columns: ["month", "hemisphere", "days", "sum_of_daily_means", "mean", "smoothed"],
        rows: inKeyOrder(series.monthly).map((m) => [
          m.month,
          m.hemisphere,
          m.days,
          m.sumOfDailyMeans,
          m.mean,
          m.smoothed,
        ]),
      },
      { sql: "DELETE FROM series_yearly" },
      {
        table: "series_yearly",
        columns: ["year", "hemisphere", "days", "mean"],
        rows: series.yearly.map((y) => [y.year, y.hemisphere, y.days, y.mean]),
      },
      ...packWrites,
      bumpSeriesRevisionStatement(),
    ]);
    lap("write");

    const dirtyDays = dirty.stop();
    if (dirtyDays.length > 0) {
      await onProgress(0.97, `Catching up ${dirtyDays.length} days reviewed during the recompute`);
      await refreshSeriesForDays({ days: dirtyDays });
      notes.push(
        `${dirtyDays.length} days reviewed during the recompute were brought up to date afterwards.`,
      );
    }
    lap("catch-up");

    return {
      observations: counts.length,
      units: units.length,
      periods: fitted.periods,
      kCoefficients: kRows.length,
      days: series.daily.filter((d) => d.hemisphere === "all").length,
      months: series.monthly.filter((m) => m.hemisphere === "all").length,
      notes,
      timingsMs,
      kFitThreads: fitted.threads,
    };
  } finally {
    dirty.stop();
  }
}

/** Fits every unit's k for every period, and the k that scales each count. */
async function fitAllK({
  counts,
  countOfUnit,
  units,
  labelOf,
  settings,
  notes,
  onProgress,
  threads,
}: {
  counts: AcceptedCounts;
  /** Accepted counts of each unit. */
  countOfUnit: Int32Array;
  units: KUnit[];
  labelOf: (unit: number) => string;
  settings: KSettings;
  notes: string[];
  onProgress: Progress;
  threads: 1 | 2;
}): Promise<{
  fits: KFit[];
  kOfRow: Float64Array;
  periods: number;
  referenceLabel: (role: KFit["role"]) => string;
  threads: 1 | 2;
}> {
  let reference: KFitReference;
  let referenceLabel: (role: KFit["role"]) => string;
  if (settings.referenceSeriesId === NETWORK_REFERENCE) {
    const pilotObserverId = settings.pilotObserverId ?? findBusiestObserver({ countOfUnit, units });
    reference = { kind: "network", pilotObserverId, pilotK: settings.pilotK };
    referenceLabel = (role) =>
      role === "pilot"
        ? K_REFERENCE.pilot
        : role === "stand-in pilot"
          ? K_REFERENCE.standIn
          : K_REFERENCE.network;
  } else {
    const series = await getReferenceSeries({ seriesId: settings.referenceSeriesId });
    if (!series)
      throw new Error("The chosen reference series no longer exists; choose another in the k settings.");
    reference = { kind: "series", values: await loadReferenceValues({ seriesId: series.id }) };
    referenceLabel = () => K_REFERENCE.series(series.id);
  }
  await onProgress(0.15, "Fitting k coefficients");
  const periods = sliceByKey({ counts, keyOf: (day) => findPeriodIndex({ day, kind: settings.periodKind }) });
  let lastReported = performance.now();
  const fitted = await fitAllPeriods({
    counts,
    units,
    periods,
    method: settings.method,
    minCommonDays: settings.minCommonDays,
    reference,
    threads,
    betweenPeriods: async (position, taken) => {
      if (performance.now() - lastReported > 250) {
        const label = describePeriod({ index: periods[position]!.key, kind: settings.periodKind }).label;
        await onProgress(0.15 + (0.6 * taken) / periods.length, `Fitting k coefficients (${label})`);
        lastReported = performance.now();
      } else {
        await yieldToServer();
      }
    },
  });
  const results = fitted.results;
  const fits: KFit[] = [];
  for (const [position, result] of results.entries()) {
    fits.push(...result.fits);
    const label = describePeriod({ index: periods[position]!.key, kind: settings.periodKind }).label;
    if (result.standIn) {
      notes.push(
        `${label}: the pilot had too few common days; ${labelOf(result.standIn.unit)} stood in, held at k = ${result.standIn.k.toFixed(3)}${result.standIn.anchored ? " from a neighbouring period" : " (no neighbouring k: the scale of this period is that observer's)"}.`,
      );
    }
    if (result.unfitted)
      notes.push(
        `${label}: no observer reached ${settings.minCommonDays} common days; no k for this period.`,
      );
  }
  const kOf = buildKLookup({ fits, unitCount: units.length });
  const kOfRow = new Float64Array(counts.length);
  const kOfUnit = new Float64Array(units.length);
  for (const period of periods) {
    for (let unit = 0; unit < units.length; unit++) kOfUnit[unit] = kOf(unit, period.key);
    for (let i = period.from; i < period.to; i++) kOfRow[i] = kOfUnit[counts.unit[i] as number] as number;
  }
  return { fits, kOfRow, periods: periods.length, referenceLabel, threads: fitted.threads };
}

/** The k of every count from the stored coefficients (no refit). */
async function resolveStoredK({
  counts,
  units,
}: {
  counts: AcceptedCounts;
  units: KUnit[];
}): Promise<Float64Array> {
  const result = await getDb().$client.execute(
    "SELECT observer_id AS observerId, instrument_id AS instrumentId, period_start AS periodStart, period_end AS periodEnd, k, created_at AS computedAt FROM k_coefficients",
  );
  const resolve = buildStoredKResolver(
    result.rows.map((r) => ({
      observerId: String(r.observerId),
      instrumentId: r.instrumentId === null ? null : String(r.instrumentId),
      periodStart: String(r.periodStart),
      periodEnd: String(r.periodEnd),
      k: Number(r.k),
      computedAt: Number(r.computedAt),
    })),
  );
  const kOfRow = new Float64Array(counts.length);
  let day = "";
  let dayNumber = Number.NaN;
  for (let i = 0; i < counts.length; i++) {
    if (counts.dayNumber[i] !== dayNumber) {
      dayNumber = counts.dayNumber[i] as number;
      day = formatDayNumber(dayNumber);
    }
    const unit = units[counts.unit[i] as number]!;
    kOfRow[i] = resolve({ observerId: unit.observerId, instrumentId: unit.instrumentId, day });
  }
  return kOfRow;
}

// ---------------------------------------------------------------------------
// The background job
// ---------------------------------------------------------------------------

type Runner = { jobId: string | null; starting: Promise<unknown> };
const runner = globalThis as unknown as { __heliotallyRecomputeRunner?: Runner };

function describeSummary(summary: RecomputeSummary): string {
  const main = `Recomputed ${summary.kCoefficients} k coefficients over ${summary.periods} periods and ${summary.days} days from ${summary.observations} accepted counts.`;
  return summary.notes.length > 0
    ? `${main} ${summary.notes.slice(0, 5).join(" ")}${summary.notes.length > 5 ? ` (+${summary.notes.length - 5} more notes)` : ""}`
    : main;
}

/**
 * Starts a full recompute in the background of this server process and
 * returns its job at once; the coordinator follows it through
 * GET /api/v1/jobs/[id]. Only one runs at a time: asking again while one is
 * queued or running returns that one. A job left "running" by a server that
 * stopped is marked failed, so it never blocks the next one.
 */
export async function startRecomputeJob({
  requestedByUserId,
}: {
  requestedByUserId: string;
}): Promise<{ job: JobView; started: boolean }> {
  const state = (runner.__heliotallyRecomputeRunner ??= { jobId: null, starting: Promise.resolve() });
  // Starts are taken one at a time in this process, so two quick clicks
  // cannot both find no job running and start two.
  const next = state.starting.then(() => startExclusive({ state, requestedByUserId }));
  state.starting = next.catch(() => undefined);
  return next;
}

async function startExclusive({ state, requestedByUserId }: { state: Runner; requestedByUserId: string }) {
  const active = await findActiveJob({ kind: RECOMPUTE_JOB_KIND });
  if (active) {
    if (state.jobId === active.id) return { job: active, started: false };
    await finishJob({
      jobId: active.id,
      status: "failed",
      message: "Interrupted: the server stopped before the recompute finished.",
    });
  }
  const job = await createJob({ kind: RECOMPUTE_JOB_KIND, requestedByUserId });
  state.jobId = job.id;
  void runRecomputeJob({ jobId: job.id }).finally(() => {
    if (state.jobId === job.id) state.jobId = null;
  });
  return { job, started: true };
}

/** Runs one queued recompute job to the end; exported so tests can await it. */
export async function runRecomputeJob({ jobId }: { jobId: string }): Promise<void> {
  try {
    // Let the request that started the job answer first.
    await yieldToServer();
    await markJobRunning({ jobId });
    const summary = await runFullRecompute({
      onProgress: (progress, message) => reportJobProgress({ jobId, progress, message }),
    });
    // The "far from the network" flags on counts still waiting were judged
    // with the old k values; judge them again with the new ones.
    await flagAwaitingReview();
    await finishJob({ jobId, status: "done", message: describeSummary(summary) });
  } catch (error) {
    console.error("Full recompute failed", error);
    const message = error instanceof Error ? error.message : "Unknown error";
    await finishJob({ jobId, status: "failed", message: `The recompute failed: ${message}` }).catch(
      () => undefined,
    );
  }
}

/** Waits for the job this process is running (tests, the seed script). */
export async function waitForRecompute({
  jobId,
  timeoutMs = 60_000,
}: {
  jobId: string;
  timeoutMs?: number;
}): Promise<void> {
  const started = Date.now();
  const state = runner.__heliotallyRecomputeRunner;
  while (state?.jobId === jobId && Date.now() - started < timeoutMs) {
    await new Promise((resolve) => setTimeout(resolve, 10));
  }
}
