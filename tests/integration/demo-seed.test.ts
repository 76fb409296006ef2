import { count, eq, sql, sum } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";

import { GET as getLatitudes } from "@/app/api/v1/series/latitudes/route";
import { getDb } from "@/db/client";
import { seedDemo } from "@/db/seed";
import { observationGroups, observations, reviewDecisions, tracings, users } from "@/db/schema";
import { DEMO_STAFF } from "@/lib/demo/scenario";

import { apiRequest } from "./support";

describe("the demo network's tracings", () => {
  let coordinatorId: string;

  beforeAll(async () => {
    await seedDemo(getDb());
    const [coordinator] = await getDb()
      .select()
      .from(users)
      .where(eq(users.email, DEMO_STAFF.coordinator.email));
    coordinatorId = coordinator!.id;
  }, 60_000);

  it("gives every accepted count its acceptance by the demo coordinator, and waiting counts none", async () => {
    const byStatus = await getDb()
      .select({ status: observations.status, counts: count(), decisions: count(reviewDecisions.id) })
      .from(observations)
      .leftJoin(reviewDecisions, eq(reviewDecisions.observationId, observations.id))
      .groupBy(observations.status);
    const accepted = byStatus.find((r) => r.status === "accepted")!;
    expect(accepted.decisions).toBe(accepted.counts);
    expect(byStatus.find((r) => r.status === "submitted")?.decisions).toBe(0);
    const kinds = await getDb()
      .selectDistinct({ actor: reviewDecisions.actorUserId, action: reviewDecisions.action })
      .from(reviewDecisions);
    expect(kinds).toEqual([{ actor: coordinatorId, action: "accepted" }]);
    // Decided after the count arrived, never in the future.
    const [late] = await getDb()
      .select({ n: count() })
      .from(reviewDecisions)
      .innerJoin(observations, eq(observations.id, reviewDecisions.observationId))
      .where(
        sql`${reviewDecisions.createdAt} <= ${observations.createdAt} or ${reviewDecisions.createdAt} > ${Date.now()}`,
      );
    expect(late!.n).toBe(0);
  });

  it("stores each drawing with its groups, which add up to the logged counts", async () => {
    const db = getDb();
    const [{ n: drawings } = { n: 0 }] = await db.select({ n: count() }).from(tracings);
    expect(drawings).toBeGreaterThan(100);
    const perObservation = await db
      .select({
        groups: observations.groups,
        spots: observations.spots,
        drawnGroups: count(observationGroups.id),
        drawnSpots: sum(observationGroups.spots).mapWith(Number),
      })
      .from(tracings)
      .innerJoin(observations, eq(observations.id, tracings.observationId))
      .leftJoin(observationGroups, eq(observationGroups.observationId, observations.id))
      .groupBy(observations.id);
    expect(perObservation).toHaveLength(drawings);
    for (const row of perObservation) {
      expect(row.drawnGroups).toBe(row.groups);
      expect(row.drawnSpots || 0).toBe(row.spots);
    }
  });

  it("fills the Archive's latitude–time diagram with the accepted counts' groups, in day order", async () => {
    const res = await getLatitudes(await apiRequest("/api/v1/series/latitudes", { userId: coordinatorId }));
    expect(res.status).toBe(200);
    const body = (await res.json()) as { days: string[]; latitudes: number[]; hemispheres: string[] };
    const [{ n: accepted } = { n: 0 }] = await getDb()
      .select({ n: count() })
      .from(observationGroups)
      .innerJoin(observations, eq(observations.id, observationGroups.observationId))
      .where(eq(observations.status, "accepted"));
    expect(accepted).toBeGreaterThan(1000);
    expect(body.days).toHaveLength(accepted);
    expect(body.latitudes).toHaveLength(accepted);
    // The chart draws days left to right: they must arrive sorted.
    expect(body.days.every((day, i) => i === 0 || body.days[i - 1]! <= day)).toBe(true);
    body.latitudes.forEach((lat, i) => expect(body.hemispheres[i]).toBe(lat >= 0 ? "N" : "S"));
  });
});
