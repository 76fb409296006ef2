import "server-only";

import { and, count, desc, eq, isNull } from "drizzle-orm";

import { getDb } from "../client";
import { notifications } from "../schema";

/** A user's unread messages, newest first. */
export async function listUnreadNotifications({ userId, limit }: { userId: string; limit: number }) {
  const db = getDb();
  const unread = and(eq(notifications.userId, userId), isNull(notifications.readAt));
  const [rows, totals] = await Promise.all([
    db
      .select({
        id: notifications.id,
        kind: notifications.kind,
        message: notifications.message,
        link: notifications.link,
        createdAt: notifications.createdAt,
      })
      .from(notifications)
      .where(unread)
      .orderBy(desc(notifications.createdAt))
      .limit(limit),
    db.select({ total: count() }).from(notifications).where(unread),
  ]);
  return { rows, total: totals[0]?.total ?? 0 };
}

/** Marks read every unread message of this user that points at `link` (the page being opened). */
export async function markNotificationsReadByLink({ userId, link }: { userId: string; link: string }) {
  await getDb()
    .update(notifications)
    .set({ readAt: new Date() })
    .where(and(eq(notifications.userId, userId), eq(notifications.link, link), isNull(notifications.readAt)));
}

export async function markAllNotificationsRead({ userId }: { userId: string }) {
  await getDb()
    .update(notifications)
    .set({ readAt: new Date() })
    .where(and(eq(notifications.userId, userId), isNull(notifications.readAt)));
}
