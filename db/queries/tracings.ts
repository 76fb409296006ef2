import "server-only";

import { and, asc, eq, sql } from "drizzle-orm";

import { roleSatisfies, type Role } from "@/lib/auth/roles";
import type { MeasuredGroup, ObservationCounts } from "@/lib/tracer/measure";
import { tracingDocumentSchema, type TracingDocument } from "@/lib/validation/tracing";

import { getDb } from "../client";
import {
  classroomMembers,
  classrooms,
  instruments,
  observationGroups,
  observations,
  observers,
  tracings,
} from "../schema";
import { observationCountColumns } from "./observations";

export type { ObservationCounts };

export type TracingReader = { id: string; role: Role };

/** The observation a tracing belongs to, with what the tracer needs to measure and revise counts. */
const observationForTracingColumns = {
  id: observations.id,
  observerId: observations.observerId,
  ownerUserId: observers.userId,
  observerName: observers.displayName,
  instrumentId: observations.instrumentId,
  instrumentName: instruments.name,
  observedAt: observations.observedAt,
  utDate: observations.utDate,
  ...observationCountColumns,
  status: observations.status,
};

async function findObservationForTracing({ observationId }: { observationId: string }) {
  const [row] = await getDb()
    .select(observationForTracingColumns)
    .from(observations)
    .innerJoin(observers, eq(observers.id, observations.observerId))
    .innerJoin(instruments, eq(instruments.id, observations.instrumentId))
    .where(eq(observations.id, observationId))
    .limit(1);
  return row ?? null;
}

export type ObservationForTracing = NonNullable<Awaited<ReturnType<typeof findObservationForTracing>>>;

/**
 * Who may read a tracing: its owner, coordinators (and admins, who stand in
 * for them), and the educator of a classroom the owner belongs to.
 */
async function mayRead({
  reader,
  ownerUserId,
}: {
  reader: TracingReader;
  ownerUserId: string;
}): Promise<boolean> {
  if (reader.id === ownerUserId) return true;
  if (roleSatisfies({ role: reader.role, required: ["coordinator"] })) return true;
  if (reader.role !== "educator") return false;
  const [row] = await getDb()
    .select({ one: sql<number>`1` })
    .from(classroomMembers)
    .innerJoin(classrooms, eq(classrooms.id, classroomMembers.classroomId))
    .where(and(eq(classroomMembers.userId, ownerUserId), eq(classrooms.educatorUserId, reader.id)))
    .limit(1);
  return Boolean(row);
}

const tracingColumns = {
  id: tracings.id,
  formatVersion: tracings.formatVersion,
  revision: tracings.revision,
  vector: tracings.vector,
  hasPng: sql<number>`${tracings.png} is not null`,
  createdAt: tracings.createdAt,
  updatedAt: tracings.updatedAt,
};

async function findTracingRow({ observationId }: { observationId: string }) {
  const [row] = await getDb()
    .select(tracingColumns)
    .from(tracings)
    .where(eq(tracings.observationId, observationId))
    .limit(1);
  return row ? { ...row, hasPng: Boolean(row.hasPng), vector: row.vector as TracingDocument } : null;
}

export type TracingRow = NonNullable<Awaited<ReturnType<typeof findTracingRow>>>;

export async function listGroupsOfObservation({ observationId }: { observationId: string }) {
  return getDb()
    .select({
      number: observationGroups.number,
      spots: observationGroups.spots,
      zurichClass: observationGroups.zurichClass,
      mcintoshClass: observationGroups.mcintoshClass,
      latitudeDeg: observationGroups.latitudeDeg,
      cmdDeg: observationGroups.cmdDeg,
      carringtonLonDeg: observationGroups.carringtonLonDeg,
      hemisphere: observationGroups.hemisphere,
      areaMsh: observationGroups.areaMsh,
    })
    .from(observationGroups)
    .where(eq(observationGroups.observationId, observationId))
    .orderBy(asc(observationGroups.number));
}

export type StoredGroup = Awaited<ReturnType<typeof listGroupsOfObservation>>[number];

/**
 * A tracing as a reader may see it, or null when the observation does not
 * exist or the reader may not see it (both answer 404, so ids cannot be probed).
 * `tracing` is null when the observation has no tracing yet.
 */
export async function findTracingForReader({
  reader,
  observationId,
}: {
  reader: TracingReader;
  observationId: string;
}) {
  const observation = await findObservationForTracing({ observationId });
  if (!observation || !(await mayRead({ reader, ownerUserId: observation.ownerUserId }))) return null;
  const [tracing, groups] = await Promise.all([
    findTracingRow({ observationId }),
    listGroupsOfObservation({ observationId }),
  ]);
  return { observation, tracing, groups, isOwner: observation.ownerUserId === reader.id };
}

export async function getTracingPngForReader({
  reader,
  observationId,
}: {
  reader: TracingReader;
  observationId: string;
}) {
  const observation = await findObservationForTracing({ observationId });
  if (!observation || !(await mayRead({ reader, ownerUserId: observation.ownerUserId }))) return null;
  const [row] = await getDb()
    .select({ png: tracings.png, revision: tracings.revision })
    .from(tracings)
    .where(eq(tracings.observationId, observationId))
    .limit(1);
  return row?.png ? { png: row.png, revision: row.revision } : null;
}

/** The owner's own observation with its tracing, for the tracer; null for anyone else's. */
export async function findOwnTracing({
  observerId,
  observationId,
}: {
  observerId: string;
  observationId: string;
}) {
  const observation = await findObservationForTracing({ observationId });
  if (!observation || observation.observerId !== observerId) return null;
  const tracing = await findTracingRow({ observationId });
  return { observation, tracing };
}

export class RevisionConflict extends Error {
  constructor(readonly currentRevision: number) {
    super(`The tracing is at revision ${currentRevision}.`);
    this.name = "RevisionConflict";
  }
}

/** What is stored of one measured group (its observation_groups row without the observation). */
export function toGroupFields(g: MeasuredGroup) {
  return {
    number: g.number,
    spots: g.spotCount,
    zurichClass: g.zurichClass,
    mcintoshClass: g.mcintoshClass,
    latitudeDeg: g.latitudeDeg,
    cmdDeg: g.cmdDeg,
    carringtonLonDeg: g.carringtonLonDeg,
    hemisphere: g.hemisphere,
    areaMsh: g.areaMsh,
  };
}

/** The rows of observation_groups for a tracing's measured groups (also used by the demo seed). */
export function toGroupRows({ observationId, groups }: { observationId: string; groups: MeasuredGroup[] }) {
  return groups.map((g) => ({ observationId, ...toGroupFields(g) }));
}

/**
 * Stores a tracing, its groups and the observation's counts in one
 * transaction: either all three change or none does. The revision check
 * comes last on purpose, so a stale save also undoes the count update.
 */
export async function saveTracing({
  observerId,
  observationId,
  document,
  png,
  baseRevision,
  groups,
  counts,
  countsChanged,
}: {
  observerId: string;
  observationId: string;
  document: TracingDocument;
  png: Buffer | null;
  baseRevision: number;
  groups: MeasuredGroup[];
  counts: ObservationCounts;
  countsChanged: boolean;
}): Promise<{ revision: number }> {
  return getDb().transaction(async (tx) => {
    const now = new Date();
    if (countsChanged) {
      // Changed counts go back to the review queue, as any corrected observation does.
      await tx
        .update(observations)
        .set({ ...counts, status: "submitted", updatedAt: now })
        .where(and(eq(observations.id, observationId), eq(observations.observerId, observerId)));
    }

    await tx.delete(observationGroups).where(eq(observationGroups.observationId, observationId));
    if (groups.length > 0) {
      await tx.insert(observationGroups).values(toGroupRows({ observationId, groups }));
    }

    const vector = document as unknown as Record<string, unknown>;
    const [current] = await tx
      .select({ revision: tracings.revision })
      .from(tracings)
      .where(eq(tracings.observationId, observationId))
      .limit(1);
    if (!current) {
      if (baseRevision !== 0) throw new RevisionConflict(0);
      await tx
        .insert(tracings)
        .values({ observationId, observerId, formatVersion: document.version, revision: 1, vector, png });
      return { revision: 1 };
    }
    const [updated] = await tx
      .update(tracings)
      .set({ formatVersion: document.version, revision: current.revision + 1, vector, png, updatedAt: now })
      .where(and(eq(tracings.observationId, observationId), eq(tracings.revision, baseRevision)))
      .returning({ revision: tracings.revision });
    if (!updated) throw new RevisionConflict(current.revision);
    return { revision: updated.revision };
  });
}

/** What the observation page shows of a tracing (the caller has already checked the observation is theirs). */
export async function getTracingSummary({ observationId }: { observationId: string }) {
  const [row] = await getDb()
    .select({
      revision: tracings.revision,
      updatedAt: tracings.updatedAt,
      hasPng: sql<number>`${tracings.png} is not null`,
      vector: tracings.vector,
    })
    .from(tracings)
    .where(eq(tracings.observationId, observationId))
    .limit(1);
  if (!row) return null;
  const groups = await listGroupsOfObservation({ observationId });
  // Stored tracings were checked when saved; one that no longer reads (an
  // older format) is simply not drawn.
  const parsed = tracingDocumentSchema.safeParse(row.vector);
  return {
    revision: row.revision,
    updatedAt: row.updatedAt,
    hasPng: Boolean(row.hasPng),
    document: parsed.success ? parsed.data : null,
    groups,
  };
}

export type TracingSummaryData = NonNullable<Awaited<ReturnType<typeof getTracingSummary>>>;
