import "server-only";

import { and, desc, eq, isNull } from "drizzle-orm";

import { getDb } from "../client";
import { instruments, kCoefficients, observers } from "../schema";

export async function getObserverByUserId({ userId }: { userId: string }) {
  const [row] = await getDb().select().from(observers).where(eq(observers.userId, userId)).limit(1);
  return row ?? null;
}

export async function listInstrumentsByObserver({ observerId }: { observerId: string }) {
  return getDb()
    .select({ id: instruments.id, name: instruments.name, kind: instruments.kind })
    .from(instruments)
    .where(and(eq(instruments.observerId, observerId), isNull(instruments.archivedAt)))
    .orderBy(instruments.createdAt);
}

export async function getInstrumentOfObserver({
  observerId,
  instrumentId,
}: {
  observerId: string;
  instrumentId: string;
}) {
  const [row] = await getDb()
    .select()
    .from(instruments)
    .where(
      and(
        eq(instruments.id, instrumentId),
        eq(instruments.observerId, observerId),
        isNull(instruments.archivedAt),
      ),
    )
    .limit(1);
  return row ?? null;
}

export type CurrentK = { k: number; computed: boolean; sigma: number | null; periodEnd: string | null };

/**
 * The observer's current k for an instrument: the newest coefficient for that
 * instrument, else the newest one kept for the observer as a whole, else 1.0
 * (no k has been computed yet, so raw counts stand as they are).
 */
export async function getCurrentKs({ observerId }: { observerId: string }) {
  const rows = await getDb()
    .select({
      instrumentId: kCoefficients.instrumentId,
      k: kCoefficients.k,
      sigma: kCoefficients.sigma,
      periodEnd: kCoefficients.periodEnd,
    })
    .from(kCoefficients)
    .where(eq(kCoefficients.observerId, observerId))
    .orderBy(desc(kCoefficients.periodEnd), desc(kCoefficients.computedAt));

  const byInstrument = new Map<string, CurrentK>();
  let overall: CurrentK | null = null;
  for (const row of rows) {
    const value = { k: row.k, computed: true, sigma: row.sigma, periodEnd: row.periodEnd };
    if (row.instrumentId === null) overall ??= value;
    else if (!byInstrument.has(row.instrumentId)) byInstrument.set(row.instrumentId, value);
  }
  const fallback: CurrentK = overall ?? { k: 1, computed: false, sigma: null, periodEnd: null };
  return (instrumentId: string): CurrentK => byInstrument.get(instrumentId) ?? fallback;
}
