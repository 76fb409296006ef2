import "server-only";

import { and, asc, count, desc, eq, isNotNull, isNull, sql } from "drizzle-orm";

import type { InstrumentRecord } from "@/lib/instruments/profile";
import type { UnitSystem } from "@/lib/optics/units";

import { getDb } from "../client";
import { instruments, kCoefficients, observations, observers } from "../schema";

/**
 * Instrument profiles. Every read and write takes the owner's observerId and
 * filters on it, so someone else's instrument is simply "not found".
 */

const instrumentColumns = {
  id: instruments.id,
  observerId: instruments.observerId,
  name: instruments.name,
  kind: instruments.kind,
  params: instruments.params,
  notes: instruments.notes,
  archivedAt: instruments.archivedAt,
  createdAt: instruments.createdAt,
};

export type InstrumentKForView = { k: number; sigma: number | null; periodStart: string; periodEnd: string };

export type InstrumentView = {
  id: string;
  observerId: string;
  name: string;
  kind: InstrumentRecord["kind"];
  params: Record<string, unknown>;
  notes: string | null;
  archivedAt: Date | null;
  createdAt: Date;
  observationCount: number;
  /** The newest k computed for this instrument, if any. */
  k: InstrumentKForView | null;
};

/** The observer's instruments, in use first then archived, each with its use count and newest k. */
export async function listInstrumentsWithUsage({
  observerId,
}: {
  observerId: string;
}): Promise<InstrumentView[]> {
  const db = getDb();
  const [rows, usage, ks] = await Promise.all([
    db
      .select(instrumentColumns)
      .from(instruments)
      .where(eq(instruments.observerId, observerId))
      .orderBy(sql`${instruments.archivedAt} is not null`, asc(instruments.createdAt)),
    db
      .select({ instrumentId: observations.instrumentId, n: count() })
      .from(observations)
      .where(eq(observations.observerId, observerId))
      .groupBy(observations.instrumentId),
    listNewestKs({ observerId }),
  ]);
  const usageById = new Map(usage.map((u) => [u.instrumentId, u.n]));
  return rows.map((row) => ({
    ...row,
    observationCount: usageById.get(row.id) ?? 0,
    k: ks.get(row.id) ?? null,
  }));
}

/** One instrument of the observer's, archived or not, or null. */
export async function getInstrumentWithUsage({
  observerId,
  instrumentId,
}: {
  observerId: string;
  instrumentId: string;
}): Promise<InstrumentView | null> {
  const db = getDb();
  const [row] = await db
    .select(instrumentColumns)
    .from(instruments)
    .where(and(eq(instruments.id, instrumentId), eq(instruments.observerId, observerId)))
    .limit(1);
  if (!row) return null;
  const [[usage], ks] = await Promise.all([
    db.select({ n: count() }).from(observations).where(eq(observations.instrumentId, instrumentId)),
    listNewestKs({ observerId, instrumentId }),
  ]);
  return { ...row, observationCount: usage?.n ?? 0, k: ks.get(row.id) ?? null };
}

/** Whose instrument this is; only for coordinators, who may read any observer's list. */
export async function findInstrumentOwner({
  instrumentId,
}: {
  instrumentId: string;
}): Promise<string | null> {
  const [row] = await getDb()
    .select({ observerId: instruments.observerId })
    .from(instruments)
    .where(eq(instruments.id, instrumentId))
    .limit(1);
  return row?.observerId ?? null;
}

export async function insertInstrument({
  observerId,
  record,
}: {
  observerId: string;
  record: InstrumentRecord;
}): Promise<InstrumentView> {
  const [row] = await getDb()
    .insert(instruments)
    .values({ observerId, ...record })
    .returning({ id: instruments.id });
  if (!row) throw new Error("insert returned nothing");
  const created = await getInstrumentWithUsage({ observerId, instrumentId: row.id });
  if (!created) throw new Error("created instrument not found");
  return created;
}

export type UpdateOutcome =
  | { status: "updated"; instrument: InstrumentView }
  | { status: "not-found" }
  | { status: "kind-locked"; observationCount: number };

/**
 * Replaces the profile. Once observations use an instrument its kind is
 * fixed: those counts, and the k fitted to them, were made with that kind.
 * The check and the write share one transaction so a count logged in
 * between cannot slip past it.
 */
export async function updateInstrument({
  observerId,
  instrumentId,
  record,
}: {
  observerId: string;
  instrumentId: string;
  record: InstrumentRecord;
}): Promise<UpdateOutcome> {
  const outcome = await getDb().transaction(
    async (tx): Promise<Exclude<UpdateOutcome, { status: "updated" }> | null> => {
      const [current] = await tx
        .select({ kind: instruments.kind })
        .from(instruments)
        .where(and(eq(instruments.id, instrumentId), eq(instruments.observerId, observerId)))
        .limit(1);
      if (!current) return { status: "not-found" };
      if (current.kind !== record.kind) {
        const [usage] = await tx
          .select({ n: count() })
          .from(observations)
          .where(eq(observations.instrumentId, instrumentId));
        if ((usage?.n ?? 0) > 0) return { status: "kind-locked", observationCount: usage?.n ?? 0 };
      }
      await tx
        .update(instruments)
        .set({ name: record.name, kind: record.kind, notes: record.notes, params: record.params })
        .where(and(eq(instruments.id, instrumentId), eq(instruments.observerId, observerId)));
      return null;
    },
  );
  if (outcome) return outcome;
  const instrument = await getInstrumentWithUsage({ observerId, instrumentId });
  return instrument ? { status: "updated", instrument } : { status: "not-found" };
}

/** Archives (or restores) an instrument; its observations keep pointing at it. */
export async function setInstrumentArchived({
  observerId,
  instrumentId,
  archived,
}: {
  observerId: string;
  instrumentId: string;
  archived: boolean;
}): Promise<InstrumentView | null> {
  await getDb()
    .update(instruments)
    .set({ archivedAt: archived ? new Date() : null })
    .where(
      and(
        eq(instruments.id, instrumentId),
        eq(instruments.observerId, observerId),
        // Archiving twice keeps the first date; restoring twice does nothing.
        archived ? isNull(instruments.archivedAt) : isNotNull(instruments.archivedAt),
      ),
    );
  // Null when it is not the caller's (or does not exist).
  return getInstrumentWithUsage({ observerId, instrumentId });
}

export type DeleteOutcome =
  { status: "deleted" } | { status: "not-found" } | { status: "in-use"; observationCount: number };

/** Deletes an instrument no observation uses; one with observations can only be archived. */
export async function deleteUnusedInstrument({
  observerId,
  instrumentId,
}: {
  observerId: string;
  instrumentId: string;
}): Promise<DeleteOutcome> {
  return getDb().transaction(async (tx): Promise<DeleteOutcome> => {
    const [current] = await tx
      .select({ id: instruments.id })
      .from(instruments)
      .where(and(eq(instruments.id, instrumentId), eq(instruments.observerId, observerId)))
      .limit(1);
    if (!current) return { status: "not-found" };
    const [usage] = await tx
      .select({ n: count() })
      .from(observations)
      .where(eq(observations.instrumentId, instrumentId));
    if ((usage?.n ?? 0) > 0) return { status: "in-use", observationCount: usage?.n ?? 0 };
    await tx
      .delete(instruments)
      .where(and(eq(instruments.id, instrumentId), eq(instruments.observerId, observerId)));
    return { status: "deleted" };
  });
}

export async function setObserverUnitSystem({
  observerId,
  unitSystem,
}: {
  observerId: string;
  unitSystem: UnitSystem;
}): Promise<void> {
  await getDb().update(observers).set({ unitSystem }).where(eq(observers.id, observerId));
}

/** For coordinators reading an observer's list: who it is, or null. */
export async function getObserverSummary({ observerId }: { observerId: string }) {
  const [row] = await getDb()
    .select({
      id: observers.id,
      displayName: observers.displayName,
      code: observers.code,
      unitSystem: observers.unitSystem,
    })
    .from(observers)
    .where(eq(observers.id, observerId))
    .limit(1);
  return row ?? null;
}

/** Newest k per instrument (by period end, then computation time). */
async function listNewestKs({
  observerId,
  instrumentId,
}: {
  observerId: string;
  instrumentId?: string;
}): Promise<Map<string, InstrumentKForView>> {
  const rows = await getDb()
    .select({
      instrumentId: kCoefficients.instrumentId,
      k: kCoefficients.k,
      sigma: kCoefficients.sigma,
      periodStart: kCoefficients.periodStart,
      periodEnd: kCoefficients.periodEnd,
    })
    .from(kCoefficients)
    .where(
      and(
        eq(kCoefficients.observerId, observerId),
        instrumentId === undefined
          ? isNotNull(kCoefficients.instrumentId)
          : eq(kCoefficients.instrumentId, instrumentId),
      ),
    )
    .orderBy(desc(kCoefficients.periodEnd), desc(kCoefficients.computedAt));
  const out = new Map<string, InstrumentKForView>();
  for (const row of rows) {
    if (row.instrumentId !== null && !out.has(row.instrumentId)) {
      out.set(row.instrumentId, {
        k: row.k,
        sigma: row.sigma,
        periodStart: row.periodStart,
        periodEnd: row.periodEnd,
      });
    }
  }
  return out;
}
