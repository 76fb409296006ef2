import "server-only";

import type { Client, Transaction } from "@libsql/client";

import { formatDayNumber } from "@/lib/counts/series";
import { makeOrderedIdMaker } from "@/lib/ids/ordered-ids";
import { countsFromPacks, sliceByKey, type AcceptedCounts } from "@/lib/series/accepted-counts";
import { packsFromPackedText, type CountPack } from "@/lib/series/count-packs";
import {
  fitAllPeriods,
  isKFitHelperRunning,
  startHelperWrite,
  type KFitReference,
} from "@/lib/series/k-fit-helper";
import { buildKLookup, buildStoredKResolver, type KFit, type KUnit } from "@/lib/series/k-fit";
import {
  dailyColumnsOf,
  seriesFromDailyColumns,
  SERIES_HEMISPHERES,
  type DailyColumns,
  type Hemisphere,
} from "@/lib/series/network-series";
import { describePeriod, findPeriodIndex } from "@/lib/series/periods";
import { PACKED_COUNT_SQL } from "@/lib/series/packed-count";
import { NETWORK_REFERENCE, type KSettings } from "@/lib/validation/k-settings";

import { writeAllOrNothing, type WriteStep } from "../bulk-write";
import type { ColumnarRows } from "../sync-write";
import { embeddedFileOf, getDb, holdWrites } from "../client";
import { countPackWrites, readTrustedPacks } from "./count-packs";
import { createJob, findActiveJob, finishJob, markJobRunning, reportJobProgress, type JobView } from "./jobs";
import { flagAwaitingReview } from "./review-flags";
import { getKSettings, K_REFERENCE } from "./k";
import { getReferenceSeries, loadReferenceValues } from "./reference-series";
import {
  acceptedPackedIndexHint,
  bumpSeriesRevisionStatement,
  DAILY_COLUMNS,
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
 * The accepted counts as the last full recompute of this process read them,
 * kept for the next one, which then reads nothing but the instruments and
 * one number: a million counts are 20 MB of arrays, and rebuilding them from
 * the stored packs is most of a recompute's read.
 *
 * The key says when they still hold. Every change to an accepted count, by
 * any process, takes a new seq in count_pack_changes (the triggers of
 * drizzle/0005_count-packs.sql), and AUTOINCREMENT never hands out a seq
 * twice, so the table's last seq (in sqlite_sequence) names the accepted
 * counts' version. With it go the instruments and their observers in unit
 * order, which the arrays' unit numbers refer to, and the number and last
 * rowid of the stored packs, so packs removed or written anew by anything
 * but this process's recompute are read again. A pack damaged in place is
 * not seen until a recompute reads the packs again (after a restart, or
 * after any change to an accepted count); it is then rebuilt.
 */
export type KeptCounts = {
  key: string;
  counts: AcceptedCounts;
  countOfUnit: Int32Array;
  units: KUnit[];
  observerOfUnit: Int32Array;
};

const keptCounts = new WeakMap<object, KeptCounts>();

export type CountsVersion = { seq: number; packs: number; lastPack: number };

async function readCountsVersion(reader: Pick<Transaction, "execute">): Promise<CountsVersion> {
  const result = await reader.execute(
    `SELECT (SELECT seq FROM sqlite_sequence WHERE name = 'count_pack_changes') AS seq,
            (SELECT count(*) FROM count_packs) AS packs, (SELECT max(rowid) FROM count_packs) AS lastPack`,
  );
  const row = result.rows[0];
  return { seq: Number(row?.seq ?? 0), packs: Number(row?.packs ?? 0), lastPack: Number(row?.lastPack ?? 0) };
}

/** `instruments`: every instrument and its observer, in unit order. */
function keyOfCounts({ version, instruments }: { version: CountsVersion; instruments: string }): string {
  return `${version.seq}|${version.packs}|${version.lastPack}|${instruments}`;
}

/**
 * Keeps what a recompute read once its write is done. Its own write stored
 * packs anew, so the key takes the packs as they are now, provided no count
 * changed since the read (the seq is the one read); else nothing is kept.
 */
async function keepCounts({
  client,
  read,
  kept,
}: {
  client: Client;
  /** The version and instruments the recompute read. */
  read: { version: CountsVersion; instruments: string };
  kept: Omit<KeptCounts, "key">;
}): Promise<void> {
  const now = await readCountsVersion(client);
  if (now.seq !== read.version.seq) keptCounts.delete(client);
  else keptCounts.set(client, { key: keyOfCounts({ version: now, instruments: read.instruments }), ...kept });
}

/** Drops the kept counts, so the next recompute reads them from the database (as after a restart). */
export function forgetKeptCounts(): void {
  keptCounts.delete(getDb().$client);
}

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
export async function loadAcceptedCounts({ reuse = null }: { reuse?: KeptCounts | null } = {}): Promise<
  {
    counts: AcceptedCounts;
    countOfUnit: Int32Array;
    packWrites: WriteStep[];
    /** Names the accepted counts read: equal keys, equal counts (see KeptCounts). */
    key: string;
    /** True when `reuse` still held the accepted counts and nothing was read again. */
    reused: boolean;
    /** What the key was made of (keepCounts). */
    version: CountsVersion;
    instruments: string;
  } & Units
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
  let key = "";
  let version: CountsVersion = { seq: 0, packs: 0, lastPack: 0 };
  let instruments = "";
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
    version = await readCountsVersion(reader);
    instruments = instrumentRows.rows
      .map((row) => `${String(row.instrumentId)}:${String(row.observerId)}`)
      .join(",");
    key = keyOfCounts({ version, instruments });
    if (reuse?.key === key) {
      return {
        ...reuse,
        packWrites: [],
        reused: true,
        version,
        instruments,
        labelOf: (unit) => labels[unit] ?? `unit ${unit}`,
      };
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
    key,
    reused: false,
    version,
    instruments,
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
  /** The thread that wrote the result: the helper as it was made, or the server's at the end (openResultWriter). */
  writtenOn: "helper" | "server";
  /** True when the accepted counts were those the last recompute read (KeptCounts). */
  countsReused: boolean;
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

/** A slice's daily rows as one columnar insert, in the order of the table's key (see inKeyOrder). */
function dailyRowsInKeyOrder(columns: DailyColumns): ColumnarRows {
  const order = new Int32Array(columns.length);
  let length = 0;
  for (const hemisphere of [...SERIES_HEMISPHERES].sort())
    for (let i = 0; i < columns.length; i++) if (columns.hemisphere[i] === hemisphere) order[length++] = i;
  const pick = (from: Float64Array) => {
    const picked = new Float64Array(length);
    for (let j = 0; j < length; j++) picked[j] = from[order[j] as number] as number;
    return picked;
  };
  const observers = new Int32Array(length);
  const day = new Array<string>(length);
  const hemisphere = new Array<string>(length);
  for (let j = 0; j < length; j++) {
    const i = order[j] as number;
    observers[j] = columns.observers[i] as number;
    day[j] = columns.day[i]!;
    hemisphere[j] = columns.hemisphere[i]!;
  }
  return {
    table: "series_daily",
    columns: DAILY_COLUMNS,
    length,
    // The order of DAILY_COLUMNS.
    values: [
      day,
      hemisphere,
      observers,
      pick(columns.sum),
      pick(columns.sumSquares),
      pick(columns.mean),
      pick(columns.sd),
    ],
  };
}

const K_COLUMNS = [
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
];

/** The rows of k_coefficients for the fitted k values, column by column (ColumnarRows). */
function kCoefficientRows({
  fitted,
  units,
  settings,
}: {
  fitted: { fits: KFit[]; referenceLabel: (role: KFit["role"]) => string };
  units: KUnit[];
  settings: KSettings;
}): ColumnarRows {
  const makeId = makeOrderedIdMaker({ startMs: Date.now() });
  // In the order of the observer–period index (and ordered ids for the
  // key): each index then grows at its end instead of all over its pages,
  // which measured about a quarter faster for 5,000 coefficients. Units are
  // ranked by observer once, rather than comparing ids in every comparison.
  const byObserver = units.map((_, unit) => unit);
  byObserver.sort((a, b) =>
    units[a]!.observerId < units[b]!.observerId ? -1 : units[a]!.observerId > units[b]!.observerId ? 1 : 0,
  );
  const rank = new Int32Array(units.length);
  byObserver.forEach((unit, position) => (rank[unit] = position));
  const fits = [...fitted.fits].sort((a, b) =>
    units[a.unit]!.observerId === units[b.unit]!.observerId
      ? a.periodIndex - b.periodIndex
      : (rank[a.unit] as number) - (rank[b.unit] as number),
  );
  const periods = new Map<number, ReturnType<typeof describePeriod>>();
  const periodOf = (index: number) => {
    let period = periods.get(index);
    if (!period) {
      period = describePeriod({ index, kind: settings.periodKind });
      periods.set(index, period);
    }
    return period;
  };
  const text = (valueOf: (fit: KFit, position: number) => string) => fits.map(valueOf);
  return {
    table: "k_coefficients",
    columns: K_COLUMNS,
    length: fits.length,
    // The order of K_COLUMNS.
    values: [
      text((_, position) => makeId(position)),
      text((fit) => units[fit.unit]!.observerId),
      text((fit) => units[fit.unit]!.instrumentId),
      text((fit) => periodOf(fit.periodIndex).start),
      text((fit) => periodOf(fit.periodIndex).end),
      Float64Array.from(fits, (fit) => fit.k),
      Float64Array.from(fits, (fit) => fit.sigma ?? Number.NaN),
      Int32Array.from(fits, (fit) => fit.commonDays),
      text(() => settings.method),
      text(() => settings.periodKind),
      text((fit) => fitted.referenceLabel(fit.role)),
    ],
  };
}

/**
 * Where the recompute's result goes, all of it or none. With the helper
 * thread ready and an embedded database, each part goes to the helper as
 * soon as it is made (startHelperWrite, lib/series/k-fit-helper.ts): the
 * helper writes the k values and the first years of the daily series while
 * this thread makes the rest, and this thread is never held up by the
 * writing. `streaming` is then true, and this process's other writes wait
 * (holdWrites, db/client.ts) until commit or abort has settled, so other
 * requests may take their turns meanwhile; the caller itself must not
 * write. Else the parts are collected and written on this thread by
 * commit, in one synchronous write (writeAllOrNothing, db/bulk-write.ts).
 *
 * If the helper thread stops during its write (its transaction goes with
 * it), commit writes every part again on this thread; it then resolves to
 * "server". A write the helper refused (a constraint, say) is not tried
 * again: it would fail the same way.
 */
export async function openResultWriter({ threads }: { threads: 1 | 2 }): Promise<{
  streaming: boolean;
  add: (steps: WriteStep[]) => void;
  commit: (last: WriteStep[]) => Promise<"helper" | "server">;
  abort: () => Promise<void>;
}> {
  const db = getDb();
  const file = embeddedFileOf(db);
  const steps: WriteStep[] = [];
  if (threads === 2 && file && isKFitHelperRunning()) {
    const release = await holdWrites();
    const helper = startHelperWrite({ file });
    if (!helper) release();
    else
      return {
        streaming: true,
        add: (more) => {
          steps.push(...more);
          helper.send(more);
        },
        commit: async (last) => {
          try {
            await helper.finish("commit", last);
            return "helper";
          } catch (error) {
            release();
            if (isKFitHelperRunning()) throw error;
            await writeAllOrNothing(db, [...steps, ...last]);
            return "server";
          } finally {
            release();
          }
        },
        abort: () =>
          helper
            .finish("abort")
            .catch(() => undefined)
            .finally(release),
      };
  }
  return {
    streaming: false,
    add: (more) => void steps.push(...more),
    commit: async (last) => {
      await writeAllOrNothing(db, [...steps, ...last]);
      return "server";
    },
    abort: async () => undefined,
  };
}

/**
 * Recomputes every k and the whole stored series from the accepted counts,
 * with the coordinator's settings. Everything is computed in memory from one
 * consistent read (or from the counts the last recompute read, while they
 * hold: KeptCounts); the result replaces the k and series tables in one
 * write transaction, so readers see the old series until the new one is
 * complete. That write is made on the helper thread as the result is made
 * when it can (openResultWriter). Days refreshed incrementally meanwhile are
 * refreshed again after the write, so no review decision taken during the
 * run is lost.
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
  let kOfRow: Float64Array | null = null;
  try {
    const settings = given ?? (await getKSettings());
    await onProgress(0.02, "Reading accepted counts");
    const client = getDb().$client;
    const loaded = await loadAcceptedCounts({ reuse: keptCounts.get(client) });
    const { counts, countOfUnit, packWrites, units, observerOfUnit, labelOf } = loaded;
    lap("read");

    const notes: string[] = [];
    const fitted = refitK
      ? await fitAllK({ counts, countOfUnit, units, labelOf, settings, notes, onProgress, threads })
      : {
          fits: [] as KFit[],
          kOfRow: await resolveStoredK({ counts, units }),
          fillKOfRow: () => undefined,
          periods: 0,
          referenceLabel: () => "",
          threads: 1 as const,
        };
    kOfRow = fitted.kOfRow;
    lap("k");

    // The result goes to the helper thread as it is made, which writes it
    // while this thread makes the rest (openResultWriter); without the
    // helper, it is written here at the end.
    await onProgress(0.78, "Building and writing the daily, monthly and yearly series");
    const writer = await openResultWriter({ threads });
    let series: ReturnType<typeof seriesFromDailyColumns>;
    let writtenOn: RecomputeSummary["writtenOn"];
    let days = 0;
    let kCoefficients = 0;
    try {
      // First what needs nothing more: the deletions, then the k rows; the
      // helper writes them while this thread scales the counts and builds
      // the first daily rows, so it never waits for work.
      writer.add([
        ...(refitK ? [{ sql: "DELETE FROM k_coefficients" }] : []),
        { sql: "DELETE FROM series_daily" },
        { sql: "DELETE FROM series_monthly" },
        { sql: "DELETE FROM series_yearly" },
      ]);
      if (refitK) {
        const kRows = kCoefficientRows({ fitted, units, settings });
        kCoefficients = kRows.length;
        writer.add([kRows]);
      }
      // The daily rows a few years at a time (about 50 ms in all on a
      // million counts), each slice's rows written as soon as they are made,
      // with a turn for other requests between slices.
      const slices: DailyColumns[] = [];
      for (const { from, to } of sliceByKey({
        counts,
        keyOf: (day) => Math.floor(day / DAYS_PER_SERIES_SLICE),
      })) {
        await yieldToServer();
        fitted.fillKOfRow(from, to);
        const columns = dailyColumnsOf({ counts, kOfRow: fitted.kOfRow, observerOfUnit, from, to });
        slices.push(columns);
        writer.add([dailyRowsInKeyOrder(columns)]);
        for (const hemisphere of columns.hemisphere) if (hemisphere === "all") days++;
      }
      series = seriesFromDailyColumns(slices);
      lap("series");
      // While streaming, this process's writes wait for the commit
      // (openResultWriter), progress reports included: none is sent.
      if (!writer.streaming) {
        await yieldToServer();
        await onProgress(0.88, "Writing the new series");
      }
      writtenOn = await writer.commit([
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
        {
          table: "series_yearly",
          columns: ["year", "hemisphere", "days", "mean"],
          rows: series.yearly.map((y) => [y.year, y.hemisphere, y.days, y.mean]),
        },
        ...packWrites,
        bumpSeriesRevisionStatement(),
      ]);
    } catch (error) {
      await writer.abort();
      throw error;
    }
    if (writer.streaming && writtenOn === "server")
      notes.push(
        "The helper thread stopped during the write; the result was written on the server's thread.",
      );
    // Kept only once their packs are stored, so what is kept is also on disk.
    await keepCounts({ client, read: loaded, kept: { counts, countOfUnit, units, observerOfUnit } });
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
      kCoefficients,
      countsReused: loaded.reused,
      writtenOn,
      days,
      months: series.monthly.filter((m) => m.hemisphere === "all").length,
      notes,
      timingsMs,
      kFitThreads: fitted.threads,
    };
  } finally {
    dirty.stop();
    if (kOfRow) giveBackKOfRow(kOfRow);
  }
}

/**
 * The array of every count's k (8 MB for a million counts), kept from one
 * recompute for the next rather than made anew: memory of that size, made
 * and dropped each time, sets off collections. Taken by one recompute at a
 * time (a second one meanwhile gets a new array); every element is written
 * before it is read.
 */
let spareKOfRow: Float64Array | null = null;

function takeKOfRow(length: number): Float64Array {
  const spare = spareKOfRow;
  if (spare && spare.length >= length) {
    spareKOfRow = null;
    return spare.subarray(0, length);
  }
  return new Float64Array(length);
}

function giveBackKOfRow(kOfRow: Float64Array): void {
  const whole = new Float64Array(kOfRow.buffer);
  if (!spareKOfRow || spareKOfRow.length < whole.length) spareKOfRow = whole;
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
  /** Every count's k, written a range at a time by fillKOfRow (all of it before it is read). */
  kOfRow: Float64Array;
  fillKOfRow: (from: number, to: number) => void;
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
  const kOfRow = takeKOfRow(counts.length);
  const kOfUnit = new Float64Array(units.length);
  let periodOfUnits = -1;
  /** Writes the k of counts [from, to) into kOfRow, period by period. */
  const fillKOfRow = (from: number, to: number) => {
    for (const [position, period] of periods.entries()) {
      const start = Math.max(from, period.from);
      const end = Math.min(to, period.to);
      if (start >= end) continue;
      if (periodOfUnits !== position) {
        for (let unit = 0; unit < units.length; unit++) kOfUnit[unit] = kOf(unit, period.key);
        periodOfUnits = position;
      }
      for (let i = start; i < end; i++) kOfRow[i] = kOfUnit[counts.unit[i] as number] as number;
    }
  };
  return { fits, kOfRow, fillKOfRow, periods: periods.length, referenceLabel, threads: fitted.threads };
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
  const kOfRow = takeKOfRow(counts.length);
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
