import "server-only";

import { and, asc, eq, inArray, sql, type SQL } from "drizzle-orm";

import { getDb } from "../client";
import { instruments, observationGroups, observations, observers } from "../schema";
import { observationCountColumns } from "./observations";

/** Rows per query while streaming an export: memory stays flat however large the archive. */
const PAGE_ROWS = 2000;

const exportColumns = {
  id: observations.id,
  observerId: observations.observerId,
  observerCode: observers.code,
  observerName: observers.displayName,
  instrumentId: observations.instrumentId,
  instrumentName: instruments.name,
  observedAt: observations.observedAt,
  utDate: observations.utDate,
  ...observationCountColumns,
  status: observations.status,
  source: observations.source,
  createdAt: observations.createdAt,
};

function selectExportPage(where: SQL | undefined) {
  return getDb()
    .select(exportColumns)
    .from(observations)
    .innerJoin(observers, eq(observers.id, observations.observerId))
    .innerJoin(instruments, eq(instruments.id, observations.instrumentId))
    .where(where)
    .orderBy(asc(observations.utDate), asc(observations.observedAt), asc(observations.id))
    .limit(PAGE_ROWS);
}

export type ExportObservationRow = Awaited<ReturnType<typeof selectExportPage>>[number];

/**
 * Observations in time order, a page at a time (keyset paging on day, time
 * and id, so every page is an index seek, not an OFFSET scan).
 * Without `observerId`, the whole network.
 */
export async function* iterateObservationsForExport({
  observerId,
}: {
  observerId?: string;
}): AsyncGenerator<ExportObservationRow[]> {
  let after: { utDate: string; observedAt: Date; id: string } | null = null;
  for (;;) {
    const filters: SQL[] = [];
    if (observerId) filters.push(eq(observations.observerId, observerId));
    if (after) {
      // A row-value comparison lets SQLite start from the (observer, day)
      // index and sort only within each day, not the whole archive per page.
      filters.push(
        sql`(${observations.utDate}, ${observations.observedAt}, ${observations.id}) > (${after.utDate}, ${after.observedAt.getTime()}, ${after.id})`,
      );
    }
    const page = await selectExportPage(filters.length ? and(...filters) : undefined);
    if (page.length === 0) return;
    yield page;
    const last = page[page.length - 1]!;
    after = { utDate: last.utDate, observedAt: last.observedAt, id: last.id };
    if (page.length < PAGE_ROWS) return;
  }
}

/** Groups measured on the disk tracer (positions and classes), by observation. */
export async function listGroupsForObservations({ observationIds }: { observationIds: string[] }) {
  const byObservation = new Map<string, Array<typeof observationGroups.$inferSelect>>();
  for (let i = 0; i < observationIds.length; i += 500) {
    const part = observationIds.slice(i, i + 500);
    const rows = await getDb()
      .select()
      .from(observationGroups)
      .where(inArray(observationGroups.observationId, part))
      .orderBy(asc(observationGroups.observationId), asc(observationGroups.number));
    for (const row of rows) {
      const list = byObservation.get(row.observationId) ?? [];
      list.push(row);
      byObservation.set(row.observationId, list);
    }
  }
  return byObservation;
}

export async function listInstrumentsForExport({ observerId }: { observerId?: string }) {
  return getDb()
    .select({
      id: instruments.id,
      observerId: instruments.observerId,
      name: instruments.name,
      kind: instruments.kind,
      params: instruments.params,
      notes: instruments.notes,
      archivedAt: instruments.archivedAt,
    })
    .from(instruments)
    .where(observerId ? eq(instruments.observerId, observerId) : undefined)
    .orderBy(asc(instruments.createdAt));
}

export async function listObserversForExport() {
  return getDb()
    .select({
      id: observers.id,
      code: observers.code,
      displayName: observers.displayName,
      country: observers.country,
    })
    .from(observers)
    .orderBy(asc(observers.code));
}
