import "server-only";

import { asc, eq, sql } from "drizzle-orm";

import type { Role } from "@/lib/auth/roles";

import { getDb } from "../client";
import { observers, users } from "../schema";

export async function getUserById({ userId }: { userId: string }) {
  const [row] = await getDb().select().from(users).where(eq(users.id, userId)).limit(1);
  return row ?? null;
}

const identityQueries = new WeakMap<object, ReturnType<typeof prepareIdentityQuery>>();

function prepareIdentityQuery(db: ReturnType<typeof getDb>) {
  return db
    .select({
      id: users.id,
      name: users.name,
      email: users.email,
      role: users.role,
      disabledAt: users.disabledAt,
    })
    .from(users)
    .where(eq(users.id, sql.placeholder("userId")))
    .limit(1)
    .prepare();
}

/**
 * What the guard needs to know of a signed-in user, on every request: a
 * prepared query of five columns (building the query anew each time cost
 * more than running it).
 */
export async function getSessionIdentity({ userId }: { userId: string }) {
  const db = getDb();
  let query = identityQueries.get(db);
  if (!query) identityQueries.set(db, (query = prepareIdentityQuery(db)));
  const [row] = await query.all({ userId });
  return row ?? null;
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
