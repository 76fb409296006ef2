import "server-only";

import { and, eq, gt, isNull } from "drizzle-orm";

import { makeObserverCode } from "@/lib/observers/observer-code";

import { getDb } from "../client";
import { instruments, observers, passwordResetTokens, users } from "../schema";

/**
 * Self sign-up: a user with the observer role, their observer profile and a
 * first instrument, all or nothing.
 */
export async function createObserverAccount(input: {
  name: string;
  email: string;
  passwordHash: string;
  country: string | null;
  timeZone: string;
}) {
  const db = getDb();
  return db.transaction(async (tx) => {
    const [user] = await tx
      .insert(users)
      .values({
        name: input.name,
        email: input.email.toLowerCase(),
        passwordHash: input.passwordHash,
        role: "observer",
      })
      .returning();
    if (!user) throw new Error("insert returned nothing");
    const [observer] = await tx
      .insert(observers)
      .values({
        userId: user.id,
        displayName: input.name,
        code: makeObserverCode(),
        country: input.country,
        timeZone: input.timeZone,
      })
      .returning();
    if (!observer) throw new Error("insert returned nothing");
    await tx
      .insert(instruments)
      .values({ observerId: observer.id, name: "My first instrument", kind: "pinhole" });
    return { user, observer };
  });
}

export async function storePasswordResetToken(input: { tokenHash: string; userId: string; expiresAt: Date }) {
  await getDb().insert(passwordResetTokens).values(input);
}

/** Marks a reset token used and returns its user, or null if unknown, used or expired. */
export async function consumePasswordResetToken({ tokenHash, now }: { tokenHash: string; now: Date }) {
  const [row] = await getDb()
    .update(passwordResetTokens)
    .set({ usedAt: now })
    .where(
      and(
        eq(passwordResetTokens.tokenHash, tokenHash),
        isNull(passwordResetTokens.usedAt),
        gt(passwordResetTokens.expiresAt, now),
      ),
    )
    .returning({ userId: passwordResetTokens.userId });
  return row ?? null;
}
