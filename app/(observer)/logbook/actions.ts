"use server";

import { revalidatePath } from "next/cache";

import { markAllNotificationsRead } from "@/db/queries/notifications";
import { requireObserver } from "@/lib/auth/session";

/** Clears the Logbook's inbox; each message stays reachable from its observation page. */
export async function markAllNotificationsReadAction(): Promise<void> {
  const { user } = await requireObserver();
  await markAllNotificationsRead({ userId: user.id });
  revalidatePath("/logbook");
}
