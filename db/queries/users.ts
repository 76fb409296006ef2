import "server-only";

import { asc, eq, sql } from "drizzle-orm";

import type { Role } from "@/lib/auth/roles";

import { getDb, lookupFirstRow } from "../client";
import { observers, users } from "../schema";

export async function getUserById({ userId }: { userId: string }) {
  const [row] = await getDb().select().from(users).where(eq(users.id, userId)).limit(1);
  return row ?? null;
}

/**
 * What the guard needs to know of a signed-in user, on every request: one
 * prepared lookup of five columns (db/client.ts lookupFirstRow).
 */
export async function getSessionIdentity({ userId }: { userId: string }): Promise<{
  id: string;
  name: string | null;
  email: string | null;
  role: Role;
  disabledAt: Date | null;
} | null> {
  const row = await lookupFirstRow(
    getDb(),
    "SELECT id, name, email, role, disabled_at FROM users WHERE id = ? LIMIT 1",
    [userId],
  );
  if (!row) return null;
  const [id, name, email, role, disabledAt] = row;
  return {
    id: String(id),
    name: name === null ? null : String(name),
    email: email === null ? null : String(email),
    role: role as Role,
    disabledAt: disabledAt === null ? null : new Date(Number(disabledAt)),
  };
}

export async function getUserByEmail({ email }: { email: string }) {
  const [row] = await getDb()
    .select()
    .from(users)
    .where(eq(users.email, email.trim().toLowerCase()))
    .limit(1);
  return row ?? null;
}

export async function setUserPassword({ userId, passwordHash }: { userId: string; passwordHash: string }) {
  await getDb().update(users).set({ passwordHash }).where(eq(users.id, userId));
}

export async function setUserRole({ userId, role }: { userId: string; role: Role }) {
  await getDb().update(users).set({ role }).where(eq(users.id, userId));
}

export async function listUsersWithProfiles() {
  return getDb()
    .select({
      id: users.id,
      name: users.name,
      email: users.email,
      role: users.role,
      isDemo: users.isDemo,
      createdAt: users.createdAt,
      observerCode: observers.code,
    })
    .from(users)
    .leftJoin(observers, eq(observers.userId, users.id))
    .orderBy(asc(users.role), asc(users.name));
}

export async function countUsersByRole() {
  return getDb()
    .select({ role: users.role, count: sql<number>`count(*)` })
    .from(users)
    .groupBy(users.role);
}
