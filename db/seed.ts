import "server-only";

import { count } from "drizzle-orm";

import { hashPassword } from "@/lib/auth/password";
import { buildDemoScenario, DEMO_CLASSROOM, DEMO_PASSWORD, DEMO_STAFF } from "@/lib/demo/scenario";
import { makeRandom } from "@/lib/demo/random";
import { buildDemoTracings } from "@/lib/demo/tracings";

import type { Database } from "./client";
import { flagAwaitingReview } from "./queries/review-flags";
import { toGroupRows } from "./queries/tracings";
import {
  classroomMembers,
  classrooms,
  classroomSessions,
  instruments,
  observationGroups,
  observations,
  observers,
  reviewDecisions,
  tracings,
  users,
} from "./schema";

const CHUNK = 400;

export async function isDatabaseEmpty(db: Database): Promise<boolean> {
  const [row] = await db.select({ n: count() }).from(users);
  return (row?.n ?? 0) === 0;
}

/**
 * Loads the invented demo network. Deterministic: the same seed gives the
 * same people, counts and codes on every machine.
 */
export async function seedDemo(db: Database): Promise<{ observations: number }> {
  const scenario = buildDemoScenario();
  const codeRandom = makeRandom(7);
  const usedCodes = new Set<string>();
  const nextCode = () => {
    const alphabet = "34679ACDEFGHJKMNPQRTWXY";
    for (;;) {
      let body = "";
      for (let i = 0; i < 4; i++) body += alphabet[Math.floor(codeRandom.next() * alphabet.length)];
      const code = `HT-${body}`;
      if (!usedCodes.has(code)) {
        usedCodes.add(code);
        return code;
      }
    }
  };
  // One hash for every demo account: they share the published demo password.
  const passwordHash = await hashPassword(DEMO_PASSWORD);
  const pinHashes = await Promise.all(scenario.students.map((s) => hashPassword(s.pin)));

  let inserted = 0;
  await db.transaction(async (tx) => {
    const staff = await tx
      .insert(users)
      .values([
        {
          email: DEMO_STAFF.coordinator.email,
          name: DEMO_STAFF.coordinator.name,
          role: "coordinator",
          passwordHash,
          isDemo: true,
        },
        {
          email: DEMO_STAFF.educator.email,
          name: DEMO_STAFF.educator.name,
          role: "educator",
          passwordHash,
          isDemo: true,
        },
        {
          email: DEMO_STAFF.admin.email,
          name: DEMO_STAFF.admin.name,
          role: "admin",
          passwordHash,
          isDemo: true,
        },
      ])
      .returning();
    const educator = staff.find((u) => u.role === "educator");
    if (!educator) throw new Error("educator not created");

    const observerIds = new Map<string, { observerId: string; instrumentId: string }>();
    for (const person of scenario.observers) {
      const [user] = await tx
        .insert(users)
        .values({
          email: person.email,
          name: person.displayName,
          role: "observer",
          passwordHash,
          isDemo: true,
        })
        .returning();
      const [profile] = await tx
        .insert(observers)
        .values({
          userId: user!.id,
          displayName: person.displayName,
          code: nextCode(),
          country: person.country,
          timeZone: person.timeZone,
        })
        .returning();
      const [instrument] = await tx
        .insert(instruments)
        .values({ observerId: profile!.id, ...person.instrument })
        .returning();
      observerIds.set(person.key, { observerId: profile!.id, instrumentId: instrument!.id });
    }

    const [classroom] = await tx
      .insert(classrooms)
      .values({
        educatorUserId: educator.id,
        name: DEMO_CLASSROOM.name,
        school: DEMO_CLASSROOM.school,
        termStart: DEMO_CLASSROOM.termStart,
        termEnd: DEMO_CLASSROOM.termEnd,
        joinCode: DEMO_CLASSROOM.joinCode,
      })
      .returning();
    for (const [i, student] of scenario.students.entries()) {
      // Students have no e-mail address: they sign in with the class code and a PIN.
      const [user] = await tx
        .insert(users)
        .values({ name: student.displayName, role: "student", isDemo: true })
        .returning();
      const [profile] = await tx
        .insert(observers)
        .values({
          userId: user!.id,
          displayName: student.displayName,
          code: nextCode(),
          country: null,
          timeZone: "Europe/London",
        })
        .returning();
      const [instrument] = await tx
        .insert(instruments)
        .values({ observerId: profile!.id, ...DEMO_CLASSROOM.instrument })
        .returning();
      await tx
        .insert(classroomMembers)
        .values({ classroomId: classroom!.id, userId: user!.id, pinHash: pinHashes[i]! });
      observerIds.set(student.key, { observerId: profile!.id, instrumentId: instrument!.id });
    }
    // The club met on Wednesdays, 10:00–11:00 UT: one class session per
    // meeting, so each student's demo count belongs to its session.
    const sessionIdByDay = new Map<string, string>();
    for (const [week, day] of scenario.classSessions.entries()) {
      const [session] = await tx
        .insert(classroomSessions)
        .values({
          classroomId: classroom!.id,
          title: `Week ${week + 1}: class count`,
          day,
          opensAt: new Date(`${day}T10:00:00Z`),
          closesAt: new Date(`${day}T11:00:00Z`),
          instrumentName: DEMO_CLASSROOM.instrument.name,
          instrumentKind: DEMO_CLASSROOM.instrument.kind,
        })
        .returning();
      sessionIdByDay.set(day, session!.id);
    }
    const studentKeys = new Set(scenario.students.map((s) => s.key));

    const rows = scenario.observations.map(({ observerKey, ...o }) => {
      const ids = observerIds.get(observerKey);
      if (!ids) throw new Error(`unknown demo observer ${observerKey}`);
      const classSessionId = studentKeys.has(observerKey) ? (sessionIdByDay.get(o.utDate) ?? null) : null;
      return {
        ...o,
        ...ids,
        id: crypto.randomUUID(),
        classSessionId,
        createdAt: o.observedAt,
        updatedAt: o.observedAt,
      };
    });
    for (let i = 0; i < rows.length; i += CHUNK) {
      await tx.insert(observations).values(rows.slice(i, i + CHUNK));
    }
    inserted = rows.length;

    // Each accepted demo count was accepted by the demo coordinator the day
    // after it arrived, so the Decision log and each count's history start full.
    const coordinatorId = staff.find((u) => u.role === "coordinator")!.id;
    const now = Date.now();
    const decisionRows = rows
      .filter((row) => row.status === "accepted")
      .map((row) => ({
        observationId: row.id,
        actorUserId: coordinatorId,
        action: "accepted" as const,
        fromStatus: "submitted" as const,
        toStatus: "accepted" as const,
        note: null,
        createdAt: new Date(Math.min(now, row.observedAt.getTime() + 20 * 3_600_000)),
      }));
    for (let i = 0; i < decisionRows.length; i += CHUNK) {
      await tx.insert(reviewDecisions).values(decisionRows.slice(i, i + CHUNK));
    }

    // The weekly disk drawings of two demo observers, stored as a saved tracing is.
    const traced = [...buildDemoTracings({ observations: scenario.observations })].map(
      ([index, tracing]) => ({
        observation: rows[index]!,
        ...tracing,
      }),
    );
    const tracingRows = traced.map(({ observation, document }) => ({
      observationId: observation.id,
      observerId: observation.observerId,
      formatVersion: document.version,
      vector: document as unknown as Record<string, unknown>,
      createdAt: observation.observedAt,
      updatedAt: observation.observedAt,
    }));
    const groupRows = traced.flatMap(({ observation, groups }) =>
      toGroupRows({ observationId: observation.id, groups }),
    );
    // Drawings are large: a few per statement keeps each insert small.
    for (let i = 0; i < tracingRows.length; i += 20) {
      await tx.insert(tracings).values(tracingRows.slice(i, i + 20));
    }
    for (let i = 0; i < groupRows.length; i += CHUNK) {
      await tx.insert(observationGroups).values(groupRows.slice(i, i + CHUNK));
    }
  });
  // The demo's waiting counts get the same automatic flags as live arrivals,
  // so the planted outliers show up flagged on the Review desk.
  await flagAwaitingReview({ db });
  return { observations: inserted };
}
