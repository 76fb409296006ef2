import "server-only";

import { eq, inArray } from "drizzle-orm";

import { getDb } from "../client";
import { signInThrottle } from "../schema";

export async function getThrottleRows({ keys }: { keys: string[] }) {
  return getDb().select().from(signInThrottle).where(inArray(signInThrottle.key, keys));
}

export async function saveThrottleRow(row: typeof signInThrottle.$inferInsert) {
  await getDb()
    .insert(signInThrottle)
    .values(row)
    .onConflictDoUpdate({
      target: signInThrottle.key,
      set: {
        failures: row.failures,
        windowStartedAt: row.windowStartedAt,
        lockedUntil: row.lockedUntil ?? null,
      },
    });
}

export async function clearThrottleRow({ key }: { key: string }) {
  await getDb().delete(signInThrottle).where(eq(signInThrottle.key, key));
}
