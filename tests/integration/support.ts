import { encode } from "next-auth/jwt";
import { NextRequest } from "next/server";

import { getDb } from "@/db/client";
import {
  classroomMembers,
  classrooms,
  instruments,
  observations,
  observers,
  users,
  type ObservationStatus,
} from "@/db/schema";
import type { Role } from "@/lib/auth/roles";

let counter = 0;

/** Makes a user (and, for logging roles, an observer profile with one instrument). */
export async function makeUser({ role, name }: { role: Role; name?: string }) {
  counter += 1;
  const db = getDb();
  const [user] = await db
    .insert(users)
    .values({
      name: name ?? `${role} ${counter}`,
      email: role === "student" ? null : `${role}${counter}@example.test`,
      role,
    })
    .returning();
  if (!user) throw new Error("no user");
  if (role !== "observer" && role !== "student") return { user, observer: null, instrument: null };
  const [observer] = await db
    .insert(observers)
    .values({
      userId: user.id,
      displayName: user.name ?? "x",
      code: `HT-T${String(counter).padStart(3, "0")}`,
      timeZone: "Europe/London",
    })
    .returning();
  const [instrument] = await db
    .insert(instruments)
    .values({ observerId: observer!.id, name: "Test pinhole", kind: "pinhole" })
    .returning();
  return { user, observer: observer!, instrument: instrument! };
}

export async function enrolStudent({
  educatorUserId,
  studentUserId,
}: {
  educatorUserId: string;
  studentUserId: string;
}) {
  const db = getDb();
  const [room] = await db
    .insert(classrooms)
    .values({
      educatorUserId,
      name: "Test class",
      school: "Test school",
      termStart: "2026-01-01",
      termEnd: "2026-12-31",
      joinCode: `T-${++counter}`,
    })
    .returning();
  await db.insert(classroomMembers).values({ classroomId: room!.id, userId: studentUserId, pinHash: "x" });
  return room!;
}

/** A session cookie exactly as next-auth would set it after sign-in. */
export async function sessionCookie(userId: string): Promise<string> {
  const token = await encode({ token: { sub: userId }, secret: process.env.NEXTAUTH_SECRET! });
  return `next-auth.session-token=${token}`;
}

export async function apiRequest(
  url: string,
  {
    method = "GET",
    userId,
    body,
    headers = {},
  }: { method?: string; userId?: string; body?: unknown; headers?: Record<string, string> } = {},
) {
  const h = new Headers(headers);
  if (userId) h.set("cookie", await sessionCookie(userId));
  let payload: string | undefined;
  if (body !== undefined) {
    payload = typeof body === "string" ? body : JSON.stringify(body);
    if (!h.has("content-type")) h.set("content-type", "application/json");
  }
  return new NextRequest(new URL(url, "http://localhost:3999"), { method, headers: h, body: payload });
}

type Made = Awaited<ReturnType<typeof makeUser>>;

/** Stores a count for `owner` straight in the database (10:00 UT on `day`), bypassing the routes. */
export async function insertObservation({
  owner,
  day,
  groups = 0,
  spots = 0,
  instrumentId,
  status,
}: {
  owner: Made;
  day: string;
  groups?: number;
  spots?: number;
  /** Another of the owner's instruments; their first one by default. */
  instrumentId?: string;
  /** Stored as given; "submitted" (the table's default) when left out. */
  status?: ObservationStatus;
}): Promise<string> {
  const [row] = await getDb()
    .insert(observations)
    .values({
      observerId: owner.observer!.id,
      instrumentId: instrumentId ?? owner.instrument!.id,
      observedAt: new Date(`${day}T10:00:00Z`),
      utDate: day,
      seeing: 2,
      groups,
      spots,
      status,
    })
    .returning();
  return row!.id;
}

/** Stores another pinhole instrument for `owner`, bypassing the routes. */
export async function insertInstrument({ owner, name }: { owner: Made; name: string }): Promise<string> {
  const [row] = await getDb()
    .insert(instruments)
    .values({ observerId: owner.observer!.id, name, kind: "pinhole" })
    .returning();
  return row!.id;
}
