import "server-only";

import { and, desc, eq, inArray, sql } from "drizzle-orm";

import { roleSatisfies, type Role } from "@/lib/auth/roles";

import { getDb } from "../client";
import { classroomMembers, classrooms, observations, observers, photos } from "../schema";

export type PhotoRow = typeof photos.$inferSelect;
export type PhotoViewer = { id: string; role: Role };

export async function insertPhoto(values: typeof photos.$inferInsert): Promise<PhotoRow> {
  const [row] = await getDb().insert(photos).values(values).returning();
  if (!row) throw new Error("insert returned nothing");
  return row;
}

/**
 * Who may see a photo: its owner, coordinators (admins stand in for them:
 * they review submissions), and the educator of a classroom the owner
 * belongs to. Anyone else gets null, exactly as for a missing photo.
 */
export async function findPhotoForViewer({ viewer, photoId }: { viewer: PhotoViewer; photoId: string }) {
  const [row] = await getDb()
    .select({ photo: photos, ownerUserId: observers.userId })
    .from(photos)
    .innerJoin(observers, eq(observers.id, photos.observerId))
    .where(eq(photos.id, photoId))
    .limit(1);
  if (!row) return null;
  if (row.ownerUserId === viewer.id || roleSatisfies({ role: viewer.role, required: ["coordinator"] }))
    return row.photo;
  if (viewer.role !== "educator") return null;
  const [member] = await getDb()
    .select({ one: sql<number>`1` })
    .from(classroomMembers)
    .innerJoin(classrooms, eq(classrooms.id, classroomMembers.classroomId))
    .where(and(eq(classroomMembers.userId, row.ownerUserId), eq(classrooms.educatorUserId, viewer.id)))
    .limit(1);
  return member ? row.photo : null;
}

/** The owner's own photo, or null. */
export async function findOwnPhoto({ observerId, photoId }: { observerId: string; photoId: string }) {
  const [row] = await getDb()
    .select()
    .from(photos)
    .where(and(eq(photos.id, photoId), eq(photos.observerId, observerId)))
    .limit(1);
  return row ?? null;
}

/** Photos of one observation, newest first (for the observation page). */
export async function listPhotosOfObservation({ observationId }: { observationId: string }) {
  return getDb()
    .select()
    .from(photos)
    .where(eq(photos.observationId, observationId))
    .orderBy(desc(photos.createdAt));
}

/** The newest photo id of each listed observation that has one (thumbnails in lists). */
export async function mapPhotoIdsByObservation({ observationIds }: { observationIds: string[] }) {
  const map = new Map<string, string>();
  if (observationIds.length === 0) return map;
  const rows = await getDb()
    .select({ id: photos.id, observationId: photos.observationId })
    .from(photos)
    .where(inArray(photos.observationId, observationIds))
    .orderBy(desc(photos.createdAt));
  for (const row of rows)
    if (row.observationId && !map.has(row.observationId)) map.set(row.observationId, row.id);
  return map;
}

/** The storage keys (photo and thumbnail) of an observation's photos. */
export async function listPhotoKeysOfObservation({
  observationId,
}: {
  observationId: string;
}): Promise<string[]> {
  const rows = await getDb()
    .select({ fileKey: photos.fileKey, thumbnailKey: photos.thumbnailKey })
    .from(photos)
    .where(eq(photos.observationId, observationId));
  return rows.flatMap((r) => (r.thumbnailKey ? [r.fileKey, r.thumbnailKey] : [r.fileKey]));
}

export async function deletePhotoRow({ photoId }: { photoId: string }) {
  await getDb().delete(photos).where(eq(photos.id, photoId));
}

/**
 * Deletes an observation of its owner together with its photo rows, in one
 * transaction (the schema would only unlink photos: their files are the
 * caller's to delete first). False when it is not the owner's.
 */
export async function deleteObservationWithPhotos({
  observerId,
  observationId,
}: {
  observerId: string;
  observationId: string;
}) {
  return getDb().transaction(async (tx) => {
    const [owned] = await tx
      .select({ id: observations.id })
      .from(observations)
      .where(and(eq(observations.id, observationId), eq(observations.observerId, observerId)))
      .limit(1);
    if (!owned) return false;
    await tx.delete(photos).where(eq(photos.observationId, observationId));
    await tx.delete(observations).where(eq(observations.id, observationId));
    return true;
  });
}
