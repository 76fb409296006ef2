import "server-only";

import { desc } from "drizzle-orm";

import { getDb } from "../client";
import { capturedMail } from "../schema";

export async function storeCapturedMail(message: typeof capturedMail.$inferInsert) {
  await getDb().insert(capturedMail).values(message);
}

export async function listCapturedMail({ limit }: { limit: number }) {
  return getDb().select().from(capturedMail).orderBy(desc(capturedMail.receivedAt)).limit(limit);
}
