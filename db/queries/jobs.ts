import "server-only";

import { and, desc, eq, inArray } from "drizzle-orm";

import { getDb } from "../client";
import { jobs } from "../schema";

export type JobView = {
  id: string;
  kind: string;
  status: (typeof jobs.$inferSelect)["status"];
  progress: number;
  message: string | null;
  createdAt: string;
  startedAt: string | null;
  finishedAt: string | null;
};

function toView(row: typeof jobs.$inferSelect): JobView {
  return {
    id: row.id,
    kind: row.kind,
    status: row.status,
    progress: row.progress,
    message: row.message,
    createdAt: row.createdAt.toISOString(),
    startedAt: row.startedAt?.toISOString() ?? null,
    finishedAt: row.finishedAt?.toISOString() ?? null,
  };
}

export async function createJob({
  kind,
  requestedByUserId,
  params = {},
}: {
  kind: string;
  requestedByUserId: string | null;
  params?: Record<string, unknown>;
}): Promise<JobView> {
  const [row] = await getDb()
    .insert(jobs)
    .values({ kind, requestedByUserId, params, status: "queued", createdAt: new Date() })
    .returning();
  return toView(row!);
}

export async function getJob({ jobId }: { jobId: string }): Promise<JobView | null> {
  const [row] = await getDb().select().from(jobs).where(eq(jobs.id, jobId)).limit(1);
  return row ? toView(row) : null;
}

/** The newest queued or running job of a kind, if any. */
export async function findActiveJob({ kind }: { kind: string }): Promise<JobView | null> {
  const [row] = await getDb()
    .select()
    .from(jobs)
    .where(and(eq(jobs.kind, kind), inArray(jobs.status, ["queued", "running"])))
    .orderBy(desc(jobs.createdAt))
    .limit(1);
  return row ? toView(row) : null;
}

export async function findLatestJob({ kind }: { kind: string }): Promise<JobView | null> {
  const [row] = await getDb()
    .select()
    .from(jobs)
    .where(eq(jobs.kind, kind))
    .orderBy(desc(jobs.createdAt))
    .limit(1);
  return row ? toView(row) : null;
}

export async function markJobRunning({ jobId }: { jobId: string }): Promise<void> {
  await getDb()
    .update(jobs)
    .set({ status: "running", startedAt: new Date(), progress: 0 })
    .where(eq(jobs.id, jobId));
}

export async function reportJobProgress({
  jobId,
  progress,
  message,
}: {
  jobId: string;
  progress: number;
  message: string;
}): Promise<void> {
  await getDb()
    .update(jobs)
    .set({ progress: Math.min(1, Math.max(0, progress)), message })
    .where(eq(jobs.id, jobId));
}

export async function finishJob({
  jobId,
  status,
  message,
}: {
  jobId: string;
  status: "done" | "failed";
  message: string;
}): Promise<void> {
  await getDb()
    .update(jobs)
    .set({ status, message, finishedAt: new Date(), ...(status === "done" ? { progress: 1 } : {}) })
    .where(eq(jobs.id, jobId));
}
