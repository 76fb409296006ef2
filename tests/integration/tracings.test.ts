import { count, eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";

import { GET as getTemplate } from "@/app/api/v1/disk-template/route";
import { GET as getPng } from "@/app/api/v1/observations/[id]/tracing/png/route";
import { GET as getTracing, PUT as putTracing } from "@/app/api/v1/observations/[id]/tracing/route";
import { GET as getOrientation } from "@/app/api/v1/solar-orientation/route";
import { getDb } from "@/db/client";
import { observationGroups, observations, tracings } from "@/db/schema";
import { solarOrientation } from "@/lib/solar/ephemeris";
import { heliographicToDisk } from "@/lib/solar/heliographic";
import { resolveSkyFrame, skyToDocument } from "@/lib/tracer/orientation";
import { createEmptyTracing, MAX_TRACING_BYTES, type TracingDocument } from "@/lib/validation/tracing";

import { apiRequest, enrolStudent, makeUser } from "./support";

type Made = Awaited<ReturnType<typeof makeUser>>;
let alice: Made;
let bob: Made;
let coordinator: Made;
let admin: Made;
let educator: Made;
let otherEducator: Made;
let student: Made;

const OBSERVED_AT = new Date("2026-03-14T09:30:00Z");
const SUN = solarOrientation(OBSERVED_AT);
// The smallest valid PNG: signature, IHDR (1×1, grey), IDAT, IEND.
const TINY_PNG =
  "data:image/png;base64,iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAAAAAA6fptVAAAACklEQVR4nGNgAAAAAgABSK+kcQAAAABJRU5ErkJggg==";

async function makeObservation(observer: Made, overrides: Partial<typeof observations.$inferInsert> = {}) {
  const [row] = await getDb()
    .insert(observations)
    .values({
      observerId: observer.observer!.id,
      instrumentId: observer.instrument!.id,
      observedAt: OBSERVED_AT,
      utDate: "2026-03-14",
      seeing: 2,
      groups: 0,
      spots: 0,
      ...overrides,
    })
    .returning();
  return row!;
}

/** A spot drawn where (lat, CMD) appears on a 1000-unit tracing, disk r = 400, north up. */
function spotAt(document: TracingDocument, id: string, lat: number, lon: number, groupId: string) {
  const result = resolveSkyFrame({ disk: document.disk, orientation: document.orientation });
  if (!result.ok) throw new Error(result.message);
  const p = skyToDocument({ point: heliographicToDisk({ lat, lon }, SUN)!, frame: result.frame });
  return { id, x: p.x, y: p.y, umbraRadius: 4, penumbraRadius: null, groupId, area: null };
}

/** Two groups: a northern C group of three spots, a southern H spot with an area. */
function makeTracing(): TracingDocument {
  const document: TracingDocument = {
    ...createEmptyTracing(),
    disk: { cx: 500, cy: 500, r: 400, method: "drag", limbPoints: [] },
    orientation: { mode: "drift", from: { x: 100, y: 950 }, to: { x: 700, y: 950 }, mirrored: false },
    groups: [
      { id: "gn", number: 1, zurichClass: "C", mcintoshClass: "Cao", area: null },
      { id: "gs", number: 2, zurichClass: "J", mcintoshClass: "Hsx", area: null },
    ],
  };
  const southern = spotAt(document, "s4", -14, 30, "gs");
  document.spots = [
    spotAt(document, "s1", 22, -10, "gn"),
    spotAt(document, "s2", 21.5, -7, "gn"),
    spotAt(document, "s3", 23, -4, "gn"),
    {
      ...southern,
      penumbraRadius: 9,
      area: { cx: southern.x, cy: southern.y, rx: 10, ry: 8, rotationDeg: 15 },
    },
  ];
  return document;
}

async function put(observationId: string, userId: string | undefined, body: unknown) {
  return putTracing(
    await apiRequest(`/api/v1/observations/${observationId}/tracing`, { method: "PUT", userId, body }),
    {
      params: Promise.resolve({ id: observationId }),
    },
  );
}

async function get(observationId: string, userId: string | undefined) {
  return getTracing(await apiRequest(`/api/v1/observations/${observationId}/tracing`, { userId }), {
    params: Promise.resolve({ id: observationId }),
  });
}

async function snapshot(observationId: string) {
  const db = getDb();
  const [obs] = await db.select().from(observations).where(eq(observations.id, observationId));
  const [tracing] = await db
    .select({ revision: tracings.revision })
    .from(tracings)
    .where(eq(tracings.observationId, observationId));
  const [groups] = await db
    .select({ n: count() })
    .from(observationGroups)
    .where(eq(observationGroups.observationId, observationId));
  return {
    counts: [obs!.groups, obs!.spots, obs!.northGroups, obs!.northSpots, obs!.southGroups, obs!.southSpots],
    status: obs!.status,
    revision: tracing?.revision ?? null,
    groups: groups?.n ?? 0,
  };
}

beforeAll(async () => {
  alice = await makeUser({ role: "observer", name: "Alice" });
  bob = await makeUser({ role: "observer", name: "Bob" });
  coordinator = await makeUser({ role: "coordinator" });
  admin = await makeUser({ role: "admin" });
  educator = await makeUser({ role: "educator" });
  otherEducator = await makeUser({ role: "educator" });
  student = await makeUser({ role: "student" });
  await enrolStudent({ educatorUserId: educator.user.id, studentUserId: student.user.id });
});

describe("saving and reopening a tracing", () => {
  it("stores the tracing, its groups and the observation's counts, and reopens exactly as saved", async () => {
    const obs = await makeObservation(alice, { status: "accepted" });
    const document = makeTracing();
    const res = await put(obs.id, alice.user.id, { document, png: TINY_PNG, baseRevision: 0 });
    expect(res.status).toBe(200);
    const body = await res.json();
    expect(body).toMatchObject({
      revision: 1,
      counts: { groups: 2, spots: 4, northGroups: 1, northSpots: 3, southGroups: 1, southSpots: 1 },
      differsFromTracing: false,
    });

    const [stored] = await getDb().select().from(observations).where(eq(observations.id, obs.id));
    expect(stored).toMatchObject({
      groups: 2,
      spots: 4,
      northGroups: 1,
      northSpots: 3,
      southGroups: 1,
      southSpots: 1,
    });
    // Changed counts go back to the review queue.
    expect(stored!.status).toBe("submitted");

    const groups = await getDb()
      .select()
      .from(observationGroups)
      .where(eq(observationGroups.observationId, obs.id))
      .orderBy(observationGroups.number);
    expect(groups).toHaveLength(2);
    expect(groups[0]).toMatchObject({
      number: 1,
      spots: 3,
      zurichClass: "C",
      mcintoshClass: "Cao",
      hemisphere: "N",
      areaMsh: null,
    });
    expect(groups[0]!.latitudeDeg).toBeCloseTo(22.2, 0);
    expect(groups[0]!.cmdDeg).toBeCloseTo(-7, 0);
    expect(groups[1]).toMatchObject({
      number: 2,
      spots: 1,
      zurichClass: "J",
      mcintoshClass: "Hsx",
      hemisphere: "S",
    });
    expect(groups[1]!.latitudeDeg).toBeCloseTo(-14, 6);
    expect(groups[1]!.cmdDeg).toBeCloseTo(30, 6);
    expect(groups[1]!.carringtonLonDeg).toBeCloseTo((30 + SUN.l0) % 360, 6);
    // 10 × 8 units on a 400-unit radius: 1e6 · 80 / 160 000 / 2 = 250 MSH projected, more once corrected.
    expect(groups[1]!.areaMsh!).toBeGreaterThan(250);

    const reopened = await get(obs.id, alice.user.id);
    expect(reopened.status).toBe(200);
    const tracing = await reopened.json();
    expect(tracing.document).toEqual(JSON.parse(JSON.stringify(document)));
    expect(tracing).toMatchObject({ revision: 1, formatVersion: 1 });
    expect(tracing.pngUrl).toBe(`/api/v1/observations/${obs.id}/tracing/png?revision=1`);

    const png = await getPng(
      await apiRequest(`/api/v1/observations/${obs.id}/tracing/png`, { userId: alice.user.id }),
      {
        params: Promise.resolve({ id: obs.id }),
      },
    );
    expect(png.status).toBe(200);
    expect(png.headers.get("content-type")).toBe("image/png");
    expect(Buffer.from(await png.arrayBuffer()).equals(Buffer.from(TINY_PNG.split(",")[1]!, "base64"))).toBe(
      true,
    );
  });

  it("counts a new revision on every save and refuses a stale one without changing anything", async () => {
    const obs = await makeObservation(alice);
    const document = makeTracing();
    expect((await put(obs.id, alice.user.id, { document, baseRevision: 0 })).status).toBe(200);
    const second = await put(obs.id, alice.user.id, {
      document: { ...document, spots: document.spots.slice(0, 3), groups: document.groups.slice(0, 1) },
      baseRevision: 1,
    });
    expect(second.status).toBe(200);
    expect((await second.json()).revision).toBe(2);
    const before = await snapshot(obs.id);
    expect(before).toMatchObject({ revision: 2, groups: 1, counts: [1, 3, 1, 3, 0, 0] });

    const stale = await put(obs.id, alice.user.id, { document, baseRevision: 1 });
    expect(stale.status).toBe(409);
    expect((await stale.json()).error.message).toMatch(/revision 2/);
    // The count update ran inside the transaction before the revision check: it must be undone.
    expect(await snapshot(obs.id)).toEqual(before);
  });

  it("lets the observer keep their own counts, and says they differ from the tracing", async () => {
    const obs = await makeObservation(alice);
    const counts = { groups: 2, spots: 6, northGroups: 1, northSpots: 5, southGroups: 1, southSpots: 1 };
    const res = await put(obs.id, alice.user.id, { document: makeTracing(), baseRevision: 0, counts });
    expect(res.status).toBe(200);
    const body = await res.json();
    expect(body).toMatchObject({ counts, differsFromTracing: true, tracingCounts: { groups: 2, spots: 4 } });
    expect((await snapshot(obs.id)).counts).toEqual([2, 6, 1, 5, 1, 1]);
  });

  it("refuses counts that do not add up, beside the field, and stores nothing", async () => {
    const obs = await makeObservation(alice);
    const before = await snapshot(obs.id);
    const res = await put(obs.id, alice.user.id, {
      document: makeTracing(),
      baseRevision: 0,
      counts: { groups: 2, spots: 4, northGroups: 2, northSpots: 3, southGroups: 1, southSpots: 1 },
    });
    expect(res.status).toBe(400);
    const body = await res.json();
    expect(body.error.issues).toContainEqual({
      path: "counts.northGroups",
      message: "Northern and southern groups (2 + 1) must add up to the total of 2.",
    });
    expect(await snapshot(obs.id)).toEqual(before);
  });
});

describe("who may open a tracing", () => {
  let aliceObs: string;
  let studentObs: string;
  beforeAll(async () => {
    aliceObs = (await makeObservation(alice)).id;
    studentObs = (await makeObservation(student)).id;
    expect(
      (await put(aliceObs, alice.user.id, { document: makeTracing(), png: TINY_PNG, baseRevision: 0 }))
        .status,
    ).toBe(200);
    expect(
      (await put(studentObs, student.user.id, { document: makeTracing(), png: TINY_PNG, baseRevision: 0 }))
        .status,
    ).toBe(200);
  });

  it("opens for the owner, coordinators and admins", async () => {
    for (const reader of [alice, coordinator, admin])
      expect((await get(aliceObs, reader.user.id)).status).toBe(200);
  });

  it("opens a student's tracing for their educator only", async () => {
    expect((await get(studentObs, student.user.id)).status).toBe(200);
    expect((await get(studentObs, educator.user.id)).status).toBe(200);
    expect((await get(studentObs, otherEducator.user.id)).status).toBe(404);
    expect((await get(aliceObs, educator.user.id)).status).toBe(404);
  });

  it("answers 404 to anyone else, exactly as for a missing observation", async () => {
    const other = await get(aliceObs, bob.user.id);
    expect(other.status).toBe(404);
    const missing = await get("no-such-observation", bob.user.id);
    expect(await other.json()).toEqual(await missing.json());
    expect((await get(aliceObs, student.user.id)).status).toBe(404);
    const png = await getPng(
      await apiRequest(`/api/v1/observations/${aliceObs}/tracing/png`, { userId: bob.user.id }),
      {
        params: Promise.resolve({ id: aliceObs }),
      },
    );
    expect(png.status).toBe(404);
  });

  it("asks a signed-out caller to sign in", async () => {
    expect((await get(aliceObs, undefined)).status).toBe(401);
  });

  it("lets only the owner change it", async () => {
    const before = await snapshot(aliceObs);
    expect((await put(aliceObs, bob.user.id, { document: makeTracing(), baseRevision: 1 })).status).toBe(404);
    // Coordinators and educators read but keep no Logbook: the one guard refuses them.
    expect(
      (await put(aliceObs, coordinator.user.id, { document: makeTracing(), baseRevision: 1 })).status,
    ).toBe(403);
    expect(
      (await put(studentObs, educator.user.id, { document: makeTracing(), baseRevision: 1 })).status,
    ).toBe(403);
    expect(await snapshot(aliceObs)).toEqual(before);
  });
});

describe("bad tracings are refused with a clear message and nothing stored", () => {
  const limb = (anglesDeg: number[]) =>
    anglesDeg.map((a) => ({
      x: 500 + 400 * Math.cos((a * Math.PI) / 180),
      y: 500 + 400 * Math.sin((a * Math.PI) / 180),
    }));

  const cases: Array<{ name: string; body: () => unknown; status: number; message: RegExp }> = [
    {
      name: "fewer than three limb points",
      body: () => ({
        document: {
          ...makeTracing(),
          disk: { cx: 500, cy: 500, r: 400, method: "limb-points", limbPoints: limb([10, 80]) },
        },
        baseRevision: 0,
      }),
      status: 400,
      message: /at least three different points on the limb/,
    },
    {
      name: "collinear limb points",
      body: () => ({
        document: {
          ...makeTracing(),
          disk: {
            cx: 500,
            cy: 500,
            r: 400,
            method: "limb-points",
            limbPoints: [
              { x: 0, y: 0 },
              { x: 1, y: 1 },
              { x: 2, y: 2 },
            ],
          },
        },
        baseRevision: 0,
      }),
      status: 400,
      message: /straight line/,
    },
    {
      name: "a disk with no orientation",
      body: () => ({ document: { ...makeTracing(), orientation: null }, baseRevision: 0 }),
      status: 400,
      message: /Orient the disk/,
    },
    {
      name: "a spot outside the disk",
      body: () => {
        const document = makeTracing();
        document.spots.push({
          id: "far",
          x: 990,
          y: 20,
          umbraRadius: 4,
          penumbraRadius: null,
          groupId: "gn",
          area: null,
        });
        return { document, baseRevision: 0 };
      },
      status: 400,
      message: /Spot 5 lies outside the disk/,
    },
    {
      name: "an invalid McIntosh class",
      body: () => {
        const document = makeTracing();
        document.groups[0] = { ...document.groups[0]!, mcintoshClass: "Crc" };
        return { document, baseRevision: 0 };
      },
      status: 400,
      message: /A compact \(c\) group needs penumbral spots between its ends/,
    },
    {
      name: "a class that does not fit the group",
      body: () => {
        const document = makeTracing();
        document.groups[1] = { ...document.groups[1]!, zurichClass: "D", mcintoshClass: "Dso" };
        return { document, baseRevision: 0 };
      },
      status: 400,
      message: /Group 2: Zurich class D is bipolar/,
    },
    {
      name: "a document that does not match the schema",
      body: () => ({
        document: { format: "heliotally-tracing", version: 1, spots: "many" },
        baseRevision: 0,
      }),
      status: 400,
      message: /does not match the Heliotally tracing format/,
    },
    {
      name: "a tracing over 2 MB",
      body: () => ({
        document: {
          ...makeTracing(),
          background: { imageUrl: "x".repeat(MAX_TRACING_BYTES), photoId: null, brightness: 1, contrast: 0 },
        },
        baseRevision: 0,
      }),
      status: 413,
      message: /at most 2 MB/,
    },
    {
      name: "a picture that is not a PNG",
      body: () => ({
        document: makeTracing(),
        baseRevision: 0,
        png: "data:image/png;base64,R0lGODlhAQABAAAAACw=",
      }),
      status: 400,
      message: /not a PNG/,
    },
    {
      name: "ungrouped spots",
      body: () => {
        const document = makeTracing();
        document.spots[0] = { ...document.spots[0]!, groupId: null };
        return { document, baseRevision: 0 };
      },
      status: 400,
      message: /1 spot is not in a group/,
    },
  ];

  for (const c of cases) {
    it(`refuses ${c.name}`, async () => {
      const obs = await makeObservation(alice, { groups: 1, spots: 2 });
      const before = await snapshot(obs.id);
      const res = await put(obs.id, alice.user.id, c.body());
      expect(res.status).toBe(c.status);
      const body = await res.json();
      const text = [
        body.error.message,
        ...(body.error.issues ?? []).map((i: { message: string }) => i.message),
      ].join(" ");
      expect(text).toMatch(c.message);
      expect(await snapshot(obs.id)).toEqual(before);
      expect(before.revision).toBeNull();
    });
  }
});

describe("GET /api/v1/solar-orientation", () => {
  const call = async (query: string, userId: string | undefined) =>
    getOrientation(await apiRequest(`/api/v1/solar-orientation${query}`, { userId }));

  it("answers P, B0, L0 and the rotation for any signed-in role", async () => {
    for (const who of [alice, coordinator, educator, student]) {
      const res = await call("?at=1992-10-13T00:00:00Z", who.user.id);
      expect(res.status).toBe(200);
      const body = await res.json();
      // Meeus, Astronomical Algorithms 2nd ed., Example 29.a (0h TD; the minute of ΔT is below these tolerances).
      expect(body.p).toBeCloseTo(26.27, 1);
      expect(body.b0).toBeCloseTo(5.99, 1);
      expect(body.l0).toBeCloseTo(238.63, 0);
      // The fraction of the rotation still to come is L0 / 360 (Carrington's convention).
      expect(1 - (body.carringtonRotation % 1)).toBeCloseTo(body.l0 / 360, 9);
      expect(body).toHaveProperty("semidiameterArcsec");
    }
  });

  it("refuses a missing or bad instant with 400 and a clear message", async () => {
    const missing = await call("", alice.user.id);
    expect(missing.status).toBe(400);
    expect((await missing.json()).error.message).toMatch(/Give the instant as \?at=/);
    const bad = await call("?at=last-tuesday", alice.user.id);
    expect(bad.status).toBe(400);
    expect((await bad.json()).error.message).toMatch(/ISO 8601/);
  });

  it("asks a signed-out caller to sign in", async () => {
    expect((await call("?at=2026-03-14T09:30:00Z", undefined)).status).toBe(401);
  });
});

describe("GET /api/v1/disk-template", () => {
  it("answers an SVG at true size", async () => {
    const res = await getTemplate(
      await apiRequest("/api/v1/disk-template?date=2026-03-14&diameterMm=120", { userId: alice.user.id }),
    );
    expect(res.status).toBe(200);
    expect(res.headers.get("content-type")).toContain("image/svg+xml");
    const svg = await res.text();
    expect(svg).toContain('width="210mm"');
    expect(svg).toMatch(/r="60"/);
  });

  it("refuses a size that cannot be printed", async () => {
    const res = await getTemplate(
      await apiRequest("/api/v1/disk-template?date=2026-03-14&diameterMm=900", { userId: alice.user.id }),
    );
    expect(res.status).toBe(400);
    expect((await res.json()).error.message).toMatch(/400 mm/);
  });
});
