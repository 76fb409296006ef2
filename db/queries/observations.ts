import "server-only";

import { and, asc, count, desc, eq, gte, lte, type SQL } from "drizzle-orm";

import { computeRelativeNumber } from "@/lib/counts/relative-number";
import type { ObservationInput } from "@/lib/validation/observation";

import { getDb } from "../client";
import { instruments, observations, observers, type ObservationSource } from "../schema";
import { getCurrentKs } from "./observers";

/**
 * The counts an observer reports (seeing through notes), as columns: every
 * selection of an observation's counts spreads this (exports, tracings, the
 * Review desk's revision path).
 */
export const observationCountColumns = {
  seeing: observations.seeing,
  groups: observations.groups,
  spots: observations.spots,
  northGroups: observations.northGroups,
  northSpots: observations.northSpots,
  southGroups: observations.southGroups,
  southSpots: observations.southSpots,
  notes: observations.notes,
};

const observationColumns = {
  id: observations.id,
  observerId: observations.observerId,
  instrumentId: observations.instrumentId,
  instrumentName: instruments.name,
  observedAt: observations.observedAt,
  utDate: observations.utDate,
  ...observationCountColumns,
  status: observations.status,
  source: observations.source,
  createdAt: observations.createdAt,
  updatedAt: observations.updatedAt,
};

/** Observations joined with their instrument's name; every list starts here. */
function selectObservations() {
  return getDb()
    .select(observationColumns)
    .from(observations)
    .innerJoin(instruments, eq(instruments.id, observations.instrumentId));
}

type ObservationRow = Awaited<ReturnType<typeof selectObservations>>[number];

export type ObservationView = ObservationRow & { k: number; kComputed: boolean; relativeNumber: number };

function toUtDate(at: Date): string {
  return at.toISOString().slice(0, 10);
}

/** Column values for an observation input; shared with the Review desk's revision path (db/queries/review.ts). */
export function observationValues(input: ObservationInput) {
  return {
    instrumentId: input.instrumentId,
    observedAt: input.observedAt,
    utDate: toUtDate(input.observedAt),
    seeing: input.seeing,
    groups: input.groups,
    spots: input.spots,
    northGroups: input.northGroups ?? null,
    northSpots: input.northSpots ?? null,
    southGroups: input.southGroups ?? null,
    southSpots: input.southSpots ?? null,
    notes: input.notes ?? null,
  };
}

export async function createObservation({
  observerId,
  input,
  source,
  classSessionId = null,
}: {
  observerId: string;
  input: ObservationInput;
  source: ObservationSource;
  /** Set when the count is logged for a classroom session (lib/classrooms/session-count.ts). */
  classSessionId?: string | null;
}): Promise<ObservationView> {
  const [row] = await getDb()
    .insert(observations)
    .values({ observerId, ...observationValues(input), source, classSessionId })
    .returning({ id: observations.id });
  if (!row) throw new Error("insert returned nothing");
  const created = await getObservationOfObserver({ observerId, observationId: row.id });
  if (!created) throw new Error("created observation not found");
  return created;
}

export async function updateObservationOfObserver({
  observerId,
  observationId,
  input,
}: {
  observerId: string;
  observationId: string;
  input: ObservationInput;
}): Promise<ObservationView | null> {
  const [row] = await getDb()
    .update(observations)
    .set({
      ...observationValues(input),
      status: "submitted",
      updatedAt: new Date(),
    })
    .where(and(eq(observations.id, observationId), eq(observations.observerId, observerId)))
    .returning({ id: observations.id });
  if (!row) return null;
  return getObservationOfObserver({ observerId, observationId: row.id });
}

export async function getObservationOfObserver({
  observerId,
  observationId,
}: {
  observerId: string;
  observationId: string;
}): Promise<ObservationView | null> {
  const [row] = await selectObservations()
    .where(and(eq(observations.id, observationId), eq(observations.observerId, observerId)))
    .limit(1);
  if (!row) return null;
  const kFor = await getCurrentKs({ observerId });
  return withRelativeNumber(row, kFor);
}

export type ObservationListQuery = {
  observerId: string;
  page: number;
  pageSize: number;
  sort: "asc" | "desc";
  from?: string;
  to?: string;
};

export async function listObservationsByObserver(query: ObservationListQuery) {
  const db = getDb();
  const filters: SQL[] = [eq(observations.observerId, query.observerId)];
  if (query.from) filters.push(gte(observations.utDate, query.from));
  if (query.to) filters.push(lte(observations.utDate, query.to));
  const where = and(...filters);
  const order = query.sort === "asc" ? [asc(observations.observedAt)] : [desc(observations.observedAt)];

  const [rows, totals, kFor] = await Promise.all([
    selectObservations()
      .where(where)
      .orderBy(...order)
      .limit(query.pageSize)
      .offset((query.page - 1) * query.pageSize),
    db.select({ total: count() }).from(observations).where(where),
    getCurrentKs({ observerId: query.observerId }),
  ]);
  return { rows: rows.map((r) => withRelativeNumber(r, kFor)), total: totals[0]?.total ?? 0 };
}

/** The newest submissions from every observer, for the coordinator. */
export async function listRecentSubmissions({ limit }: { limit: number }) {
  return getDb()
    .select({
      id: observations.id,
      observerName: observers.displayName,
      observerCode: observers.code,
      instrumentName: instruments.name,
      observedAt: observations.observedAt,
      utDate: observations.utDate,
      seeing: observations.seeing,
      groups: observations.groups,
      spots: observations.spots,
      status: observations.status,
      source: observations.source,
      createdAt: observations.createdAt,
    })
    .from(observations)
    .innerJoin(observers, eq(observers.id, observations.observerId))
    .innerJoin(instruments, eq(instruments.id, observations.instrumentId))
    .orderBy(desc(observations.createdAt))
    .limit(limit);
}

function withRelativeNumber(
  row: ObservationRow,
  kFor: (instrumentId: string) => { k: number; computed: boolean },
): ObservationView {
  const { k, computed } = kFor(row.instrumentId);
  return {
    ...row,
    k,
    kComputed: computed,
    relativeNumber: computeRelativeNumber({ k, groups: row.groups, spots: row.spots }),
  };
}
