import "server-only";

import { and, asc, desc, eq, gt } from "drizzle-orm";

import { getDb } from "../client";
import { importBatches, instruments, observations, observers, users } from "../schema";
import { refreshAutomaticFlags } from "./review-flags";

/** A checked logbook line waiting in the import's staging table. */
export type StagedRow = {
  line: number;
  id: string;
  instrumentId: string;
  observedAtMs: number;
  utDate: string;
  seeing: number;
  groups: number;
  spots: number;
  northGroups: number | null;
  northSpots: number | null;
  southGroups: number | null;
  southSpots: number | null;
  notes: string | null;
  importKey: string;
};

export type LineClash = { line: number; utDate: string; instrumentId: string; otherLine: number | null };

const STAGING = "heliotally_import_rows";
const STAGED_COLUMNS =
  "line, id, instrument_id, observed_at, ut_date, seeing, groups, spots, north_groups, north_spots, south_groups, south_spots, notes, import_key";
const STAGED_WIDTH = 14;
const IMPORT_CACHE_KIB = 8 * 1024;

/** Every instrument the observer ever had: old logbooks name retired instruments too. */
export async function listImportInstruments({ observerId }: { observerId: string }) {
  return getDb()
    .select({ id: instruments.id, name: instruments.name })
    .from(instruments)
    .where(eq(instruments.observerId, observerId))
    .orderBy(instruments.createdAt);
}

/**
 * One import as one write transaction. Checked rows go to a temporary
 * staging table first (so memory stays flat however long the file), then a
 * few set-based queries find repeated days, days already in the Logbook and
 * lines imported before, and one INSERT … SELECT stores the rest. Nothing
 * reaches `observations` unless `commit` is called; `rollback` (or any
 * error) leaves the database exactly as it was.
 */
export async function openImportSession({ observerId }: { observerId: string }) {
  const tx = await getDb().$client.transaction("write");
  try {
    // libSQL keeps temporary tables in memory by default; on disk, a
    // 100,000-line logbook costs no more memory than a 100-line one.
    await tx.execute("PRAGMA temp_store = FILE");
    // A bigger page cache for this connection while it writes: the indexes
    // of observations are updated all over the tree, and 2 MB (the default)
    // means re-reading pages. Fixed in size, so memory still does not grow
    // with the file.
    await tx.execute(`PRAGMA cache_size = -${IMPORT_CACHE_KIB}`);
    await tx.execute(`PRAGMA temp.cache_size = -${IMPORT_CACHE_KIB}`);
    await tx.execute(`DROP TABLE IF EXISTS temp.${STAGING}`);
    await tx.execute(
      `CREATE TEMP TABLE ${STAGING} (
        line INTEGER PRIMARY KEY, id TEXT NOT NULL, instrument_id TEXT NOT NULL, observed_at INTEGER NOT NULL,
        ut_date TEXT NOT NULL, seeing INTEGER NOT NULL, "groups" INTEGER NOT NULL, spots INTEGER NOT NULL,
        north_groups INTEGER, north_spots INTEGER, south_groups INTEGER, south_spots INTEGER, notes TEXT,
        import_key TEXT NOT NULL, skip INTEGER NOT NULL DEFAULT 0
      )`,
    );
  } catch (error) {
    tx.close();
    throw error;
  }
  // The connection goes back to the pool afterwards: leave it as it was.
  const restoreTempStore = () =>
    tx
      .batch(["PRAGMA temp_store = DEFAULT", "PRAGMA cache_size = -2000", "PRAGMA temp.cache_size = -2000"])
      .then(
        () => undefined,
        () => undefined,
      );
  let indexed = false;
  const ensureIndexed = async () => {
    // Built once after loading: cheaper than keeping it up to date row by row.
    if (indexed) return;
    await tx.execute(`CREATE INDEX temp.${STAGING}_day ON ${STAGING} (ut_date, instrument_id, line)`);
    indexed = true;
  };

  return {
    async stage(rows: StagedRow[]) {
      if (rows.length === 0) return;
      // One JSON text per batch, unpacked by SQLite's json_each, rather than
      // 14 bound values per row: the libSQL binding keeps memory for every
      // bound value until the connection closes (about six times more than
      // for the same data as one string), and the import's memory must stay
      // flat however long the file.
      const packed = JSON.stringify(
        rows.map((r) => [
          r.line,
          r.id,
          r.instrumentId,
          r.observedAtMs,
          r.utDate,
          r.seeing,
          r.groups,
          r.spots,
          r.northGroups,
          r.northSpots,
          r.southGroups,
          r.southSpots,
          r.notes,
          r.importKey,
        ]),
      );
      await tx.execute({
        sql: `INSERT INTO ${STAGING} (${STAGED_COLUMNS})
              SELECT ${Array.from({ length: STAGED_WIDTH }, (_, i) => `value ->> ${i}`).join(", ")} FROM json_each(?)`,
        args: [packed],
      });
    },

    /** Lines whose exact content was imported before: skipped, so a re-import adds nothing twice. */
    async markAlreadyImported(): Promise<number> {
      const result = await tx.execute({
        sql: `UPDATE ${STAGING} SET skip = 1 WHERE import_key IN (
                SELECT import_key FROM observations WHERE observer_id = ? AND import_key IS NOT NULL)`,
        args: [observerId],
      });
      return result.rowsAffected;
    },

    /** Later lines that repeat an earlier line's day and instrument. */
    async findRepeatedDays({ limit }: { limit: number }): Promise<{ clashes: LineClash[]; total: number }> {
      await ensureIndexed();
      // Counting first walks the index in order with no per-row work; a
      // good file (the usual case) needs nothing more.
      const counted = await tx.execute(
        `SELECT coalesce(sum(n - 1), 0) AS total FROM (
           SELECT count(*) AS n FROM ${STAGING} GROUP BY ut_date, instrument_id HAVING n > 1)`,
      );
      if (Number(counted.rows[0]?.total ?? 0) === 0) return { clashes: [], total: 0 };
      const result = await tx.execute({
        sql: `SELECT line, ut_date, instrument_id, first_line, count(*) OVER () AS total FROM (
                SELECT line, ut_date, instrument_id, min(line) OVER (PARTITION BY ut_date, instrument_id) AS first_line
                FROM ${STAGING})
              WHERE line <> first_line ORDER BY line LIMIT ?`,
        args: [limit],
      });
      return toClashes(result.rows, "first_line");
    },

    /** New lines for a day and instrument that the Logbook already holds (logged or imported before). */
    async findLogbookClashes({ limit }: { limit: number }): Promise<{ clashes: LineClash[]; total: number }> {
      await ensureIndexed();
      const result = await tx.execute({
        sql: `SELECT r.line, r.ut_date, r.instrument_id, NULL AS other_line, count(*) OVER () AS total
              FROM ${STAGING} r
              WHERE r.skip = 0 AND EXISTS (
                SELECT 1 FROM observations o
                WHERE o.observer_id = ? AND o.ut_date = r.ut_date AND o.instrument_id = r.instrument_id)
              ORDER BY r.line LIMIT ?`,
        args: [observerId, limit],
      });
      return toClashes(result.rows, "other_line");
    },

    async commit({
      batchId,
      byUserId,
      fileName,
      fileHash,
      skipped,
    }: {
      batchId: string;
      byUserId: string;
      fileName: string;
      fileHash: string;
      skipped: number;
    }): Promise<{ imported: number; firstDay: string | null; lastDay: string | null }> {
      const nowMs = Date.now();
      const span = await tx.execute(
        `SELECT min(ut_date) AS first_day, max(ut_date) AS last_day FROM ${STAGING} WHERE skip = 0`,
      );
      const inserted = await tx.execute({
        sql: `INSERT INTO observations (id, observer_id, instrument_id, observed_at, ut_date, seeing, "groups", spots,
                north_groups, north_spots, south_groups, south_spots, notes, import_key, import_batch_id,
                status, source, created_at, updated_at)
              SELECT id, ?, instrument_id, observed_at, ut_date, seeing, "groups", spots,
                north_groups, north_spots, south_groups, south_spots, notes, import_key, ?,
                'submitted', 'import', ?, ?
              FROM ${STAGING} WHERE skip = 0 ORDER BY line`,
        args: [observerId, batchId, nowMs, nowMs],
      });
      await tx.execute({
        sql: `INSERT INTO import_batches (id, observer_id, by_user_id, file_name, file_hash, rows_imported, rows_skipped, created_at)
              VALUES (?, ?, ?, ?, ?, ?, ?, ?)`,
        args: [batchId, observerId, byUserId, fileName, fileHash, inserted.rowsAffected, skipped, nowMs],
      });
      await tx.execute(`DROP TABLE temp.${STAGING}`);
      await restoreTempStore();
      await tx.commit();
      const row = span.rows[0];
      return {
        imported: inserted.rowsAffected,
        firstDay: (row?.first_day as string | null) ?? null,
        lastDay: (row?.last_day as string | null) ?? null,
      };
    },

    /** Undoes everything, the staging table included. Safe to call twice. */
    async rollback() {
      if (!tx.closed) {
        await tx.execute(`DROP TABLE IF EXISTS temp.${STAGING}`).catch(() => undefined);
        await restoreTempStore();
        await tx.rollback();
      } else tx.close();
    },
  };
}

export type ImportSession = Awaited<ReturnType<typeof openImportSession>>;

function toClashes(
  rows: Array<Record<string, unknown>>,
  otherColumn: string,
): { clashes: LineClash[]; total: number } {
  const clashes = rows.map((r) => ({
    line: Number(r.line),
    utDate: String(r.ut_date),
    instrumentId: String(r.instrument_id),
    otherLine: r[otherColumn] === null || r[otherColumn] === undefined ? null : Number(r[otherColumn]),
  }));
  return { clashes, total: rows.length === 0 ? 0 : Number(rows[0]?.total ?? 0) };
}

export async function listImportBatches({ observerId, limit }: { observerId: string; limit: number }) {
  return getDb()
    .select({
      id: importBatches.id,
      fileName: importBatches.fileName,
      rowsImported: importBatches.rowsImported,
      rowsSkipped: importBatches.rowsSkipped,
      createdAt: importBatches.createdAt,
      byName: users.name,
    })
    .from(importBatches)
    .leftJoin(users, eq(users.id, importBatches.byUserId))
    .where(eq(importBatches.observerId, observerId))
    .orderBy(desc(importBatches.createdAt))
    .limit(limit);
}

/** The observer a coordinator imports for (null when there is none). */
export async function getObserverById({ observerId }: { observerId: string }) {
  const [row] = await getDb().select().from(observers).where(eq(observers.id, observerId)).limit(1);
  return row ?? null;
}

/** Every observer with a Logbook, for the coordinator's "import for" list. */
export async function listObserversForImport() {
  return getDb()
    .select({
      id: observers.id,
      displayName: observers.displayName,
      code: observers.code,
      timeZone: observers.timeZone,
    })
    .from(observers)
    .orderBy(asc(observers.displayName));
}

/** The observations one import stored, in file order, a page at a time (for flagging them after the commit). */
export async function listObservationIdsOfBatch({
  batchId,
  afterId,
  limit,
}: {
  batchId: string;
  afterId: string | null;
  limit: number;
}) {
  const rows = await getDb()
    .select({ id: observations.id })
    .from(observations)
    .where(
      afterId
        ? and(eq(observations.importBatchId, batchId), gt(observations.id, afterId))
        : eq(observations.importBatchId, batchId),
    )
    .orderBy(asc(observations.id))
    .limit(limit);
  return rows.map((r) => r.id);
}

/** Review-desk flags for a page of imported observations, in their own short transaction. */
export async function flagImportedObservations({ observationIds }: { observationIds: string[] }) {
  await getDb().transaction(async (tx) => {
    await refreshAutomaticFlags({ observationIds, db: tx });
  });
}
