import { count, eq } from "drizzle-orm";
import { beforeAll, beforeEach, describe, expect, it, vi } from "vitest";

import { setUnitSystemAction } from "@/app/(observer)/instruments/actions";
import { POST as archive, DELETE as restore } from "@/app/api/v1/instruments/[id]/archive/route";
import { DELETE as removeOne, GET as getOne, PUT as putOne } from "@/app/api/v1/instruments/[id]/route";
import { GET as list, POST as create } from "@/app/api/v1/instruments/route";
import { getDb } from "@/db/client";
import { listInstrumentsByObserver } from "@/db/queries/observers";
import { instruments, kCoefficients, observations, observers } from "@/db/schema";

import { apiRequest, makeUser, sessionCookie } from "./support";

// Server actions read the caller from the request's cookies (next/headers);
// outside Next there is no request, so the test supplies the cookie itself.
const context = vi.hoisted(() => ({ cookie: "" }));
vi.mock("next/headers", () => ({
  cookies: async () => ({ toString: () => context.cookie }),
  headers: async () => new Headers(),
}));
vi.mock("next/cache", () => ({ revalidatePath: vi.fn() }));

type Made = Awaited<ReturnType<typeof makeUser>>;
let alice: Made;
let bob: Made;
let coordinator: Made;
let educator: Made;
let student: Made;

/** A mirror as the form sends it after converting imperial entries: 4 in mirror, ¼ in mask, 35 ft throw. */
const mirror = (overrides: Record<string, unknown> = {}) => ({
  kind: "mirror",
  name: "Porch mirror",
  mirrorSizeMm: 101.6,
  maskDiameterMm: 6.35,
  throwDistanceMm: 10_668,
  incidenceAngleDeg: 20,
  surface: "second",
  unitSystem: "imperial",
  ...overrides,
});

const eyepiece = (overrides: Record<string, unknown> = {}) => ({
  kind: "eyepiece-projection",
  name: "80 mm refractor",
  apertureMm: 80,
  focalLengthMm: 900,
  eyepieceFocalLengthMm: 25,
  eyepieceToScreenMm: 300,
  ...overrides,
});

async function countInstruments() {
  const [row] = await getDb().select({ n: count() }).from(instruments);
  return row?.n ?? 0;
}

async function readRow(id: string) {
  const [row] = await getDb().select().from(instruments).where(eq(instruments.id, id));
  return row;
}

const ctx = (id: string) => ({ params: Promise.resolve({ id }) });

async function post(body: unknown, userId: string | undefined, headers: Record<string, string> = {}) {
  return create(await apiRequest("/api/v1/instruments", { method: "POST", userId, body, headers }));
}

async function put(id: string, body: unknown, userId: string) {
  return putOne(await apiRequest(`/api/v1/instruments/${id}`, { method: "PUT", userId, body }), ctx(id));
}

async function createMirror(userId: string, overrides: Record<string, unknown> = {}) {
  const res = await post(mirror(overrides), userId);
  expect(res.status).toBe(201);
  return (await res.json()) as { id: string; params: Record<string, unknown> };
}

async function logObservation({ made, instrumentId }: { made: Made; instrumentId: string }) {
  await getDb()
    .insert(observations)
    .values({
      observerId: made.observer!.id,
      instrumentId,
      observedAt: new Date("2026-03-14T09:30:00Z"),
      utDate: "2026-03-14",
      seeing: 2,
      groups: 3,
      spots: 17,
    });
}

beforeAll(async () => {
  alice = await makeUser({ role: "observer", name: "Alice" });
  bob = await makeUser({ role: "observer", name: "Bob" });
  coordinator = await makeUser({ role: "coordinator" });
  educator = await makeUser({ role: "educator" });
  student = await makeUser({ role: "student" });
});

describe("creating an instrument", () => {
  it("stores the profile with its lengths in mm and answers 201", async () => {
    const res = await post(mirror(), alice.user.id);
    expect(res.status).toBe(201);
    const body = await res.json();
    expect(body).toMatchObject({
      name: "Porch mirror",
      kind: "mirror",
      observerId: alice.observer!.id,
      archivedAt: null,
      observationCount: 0,
      k: null,
    });
    // Only the optics go into params: name, kind and the unit system the form used are not duplicated there.
    expect(body.params).toEqual({
      mirrorSizeMm: 101.6,
      maskDiameterMm: 6.35,
      throwDistanceMm: 10_668,
      incidenceAngleDeg: 20,
      surface: "second",
    });
    const row = await readRow(body.id);
    expect(row?.params).toEqual(body.params);
    expect(row?.notes).toBeNull();
  });

  it("leaves an optional mask out of params rather than storing a blank", async () => {
    const body = await createMirror(alice.user.id, { maskDiameterMm: "" });
    expect(body.params).not.toHaveProperty("maskDiameterMm");
  });

  it("lets a student keep their own instruments", async () => {
    const res = await post(eyepiece({ name: "Class refractor" }), student.user.id);
    expect(res.status).toBe(201);
    expect((await res.json()).observerId).toBe(student.observer!.id);
  });

  it("stores one instrument for a repeated Idempotency-Key", async () => {
    const before = await countInstruments();
    const headers = { "idempotency-key": "instrument-test-key-1" };
    const first = await post(mirror({ name: "Twice sent" }), alice.user.id, headers);
    const second = await post(mirror({ name: "Twice sent" }), alice.user.id, headers);
    expect(first.status).toBe(201);
    expect(second.status).toBe(201);
    expect(second.headers.get("idempotent-replayed")).toBe("true");
    expect(await countInstruments()).toBe(before + 1);
  });
});

describe("bad input is refused with a message on the field and nothing stored", () => {
  const cases: Array<[string, unknown, string, RegExp]> = [
    [
      "a zero hole",
      { kind: "pinhole", name: "Box", holeDiameterMm: 0, boxLengthMm: 1000 },
      "holeDiameterMm",
      /greater than zero/,
    ],
    ["a negative throw", mirror({ throwDistanceMm: -3000 }), "throwDistanceMm", /greater than zero/],
    [
      "an absurd hole (inches typed as mm)",
      { kind: "pinhole", name: "Box", holeDiameterMm: 60, boxLengthMm: 1000 },
      "holeDiameterMm",
      /not a pinhole/,
    ],
    ["an absurd throw", mirror({ throwDistanceMm: 350_000 }), "throwDistanceMm", /over 200 m/],
    [
      "a mask larger than the mirror",
      mirror({ maskDiameterMm: 152.4 }),
      "maskDiameterMm",
      /can't be larger than the mirror/,
    ],
    [
      "a screen nearer than the eyepiece's focal length",
      eyepiece({ eyepieceToScreenMm: 20 }),
      "eyepieceToScreenMm",
      /farther from the eyepiece than its focal length/,
    ],
    [
      "a zero eyepiece focal length",
      eyepiece({ eyepieceFocalLengthMm: 0 }),
      "eyepieceFocalLengthMm",
      /can't be zero/,
    ],
    ["unknown units", mirror({ unitSystem: "furlongs" }), "unitSystem", /metric or imperial/],
    [
      "a missing field for the chosen kind",
      { ...mirror(), throwDistanceMm: undefined },
      "throwDistanceMm",
      /Enter the throw distance/,
    ],
    ["a text where a number belongs", mirror({ mirrorSizeMm: "four" }), "mirrorSizeMm", /must be a number/],
    ["an unknown kind", { kind: "periscope", name: "Up periscope" }, "kind", /Choose the kind of instrument/],
    ["a missing name", mirror({ name: "  " }), "name", /Give the instrument a name/],
    [
      "a camera without a filter",
      { kind: "camera", name: "Cam", focalLengthMm: 600, pixelSizeUm: 3.76, filter: "" },
      "filter",
      /solar filter/,
    ],
  ];

  it.each(cases)("%s", async (_, body, path, message) => {
    const before = await countInstruments();
    const res = await post(body, alice.user.id);
    expect(res.status).toBe(400);
    const json = await res.json();
    expect(json.error.code).toBe("invalid_input");
    const issue = json.error.issues.find((i: { path: string }) => i.path === path);
    expect(issue?.message, JSON.stringify(json.error.issues)).toMatch(message);
    expect(await countInstruments()).toBe(before);
  });

  it("a body that is not JSON", async () => {
    const before = await countInstruments();
    const res = await post("{not json", alice.user.id);
    expect(res.status).toBe(400);
    expect((await res.json()).error.code).toBe("invalid_json");
    expect(await countInstruments()).toBe(before);
  });
});

describe("editing an instrument", () => {
  it("replaces the profile", async () => {
    const created = await createMirror(alice.user.id);
    const res = await put(
      created.id,
      mirror({ name: "Porch mirror, re-masked", maskDiameterMm: 12.7, notes: "New card mask" }),
      alice.user.id,
    );
    expect(res.status).toBe(200);
    const row = await readRow(created.id);
    expect(row).toMatchObject({ name: "Porch mirror, re-masked", notes: "New card mask" });
    expect(row?.params).toMatchObject({ maskDiameterMm: 12.7 });
  });

  it("refuses bad values and leaves the stored profile as it was", async () => {
    const created = await createMirror(alice.user.id);
    const before = await readRow(created.id);
    const res = await put(created.id, mirror({ maskDiameterMm: 200, name: "Changed" }), alice.user.id);
    expect(res.status).toBe(400);
    expect((await res.json()).error.issues).toEqual(
      expect.arrayContaining([expect.objectContaining({ path: "maskDiameterMm" })]),
    );
    expect(await readRow(created.id)).toEqual(before);
  });

  it("may change the kind while no observation uses it", async () => {
    const created = await createMirror(alice.user.id);
    const res = await put(created.id, eyepiece(), alice.user.id);
    expect(res.status).toBe(200);
    expect((await readRow(created.id))?.kind).toBe("eyepiece-projection");
  });

  it("keeps the kind once observations use it (409, nothing changed)", async () => {
    const created = await createMirror(alice.user.id);
    await logObservation({ made: alice, instrumentId: created.id });
    const res = await put(created.id, eyepiece(), alice.user.id);
    expect(res.status).toBe(409);
    const json = await res.json();
    expect(json.error.issues[0]).toMatchObject({ path: "kind" });
    expect((await readRow(created.id))?.kind).toBe("mirror");
    // The same kind with new sizes is still fine.
    expect((await put(created.id, mirror({ throwDistanceMm: 9000 }), alice.user.id)).status).toBe(200);
  });
});

describe("archiving and deleting", () => {
  it("archives an instrument: it leaves the Log-a-count list but stays on its observations", async () => {
    const created = await createMirror(alice.user.id, { name: "Old mirror" });
    await logObservation({ made: alice, instrumentId: created.id });
    const res = await archive(
      await apiRequest(`/x`, { method: "POST", userId: alice.user.id }),
      ctx(created.id),
    );
    expect(res.status).toBe(200);
    const body = await res.json();
    expect(body.archivedAt).not.toBeNull();
    expect(body.observationCount).toBe(1);

    const forLogging = await listInstrumentsByObserver({ observerId: alice.observer!.id });
    expect(forLogging.map((i) => i.id)).not.toContain(created.id);
    const [used] = await getDb()
      .select({ n: count() })
      .from(observations)
      .where(eq(observations.instrumentId, created.id));
    expect(used?.n).toBe(1);

    // Archiving again keeps the first date.
    const again = await archive(
      await apiRequest(`/x`, { method: "POST", userId: alice.user.id }),
      ctx(created.id),
    );
    expect((await again.json()).archivedAt).toBe(body.archivedAt);

    const restored = await restore(
      await apiRequest(`/x`, { method: "DELETE", userId: alice.user.id }),
      ctx(created.id),
    );
    expect((await restored.json()).archivedAt).toBeNull();
    expect((await listInstrumentsByObserver({ observerId: alice.observer!.id })).map((i) => i.id)).toContain(
      created.id,
    );
  });

  it("refuses to delete an instrument with observations (409) and keeps it", async () => {
    const created = await createMirror(alice.user.id);
    await logObservation({ made: alice, instrumentId: created.id });
    const res = await removeOne(
      await apiRequest(`/x`, { method: "DELETE", userId: alice.user.id }),
      ctx(created.id),
    );
    expect(res.status).toBe(409);
    expect((await res.json()).error.message).toMatch(/Archive it instead/);
    expect(await readRow(created.id)).toBeDefined();
  });

  it("deletes an instrument no observation uses", async () => {
    const created = await createMirror(alice.user.id);
    const res = await removeOne(
      await apiRequest(`/x`, { method: "DELETE", userId: alice.user.id }),
      ctx(created.id),
    );
    expect(res.status).toBe(204);
    expect(await readRow(created.id)).toBeUndefined();
  });
});

describe("who may see and change an instrument", () => {
  let alicesId: string;
  beforeAll(async () => {
    alicesId = (await createMirror(alice.user.id, { name: "Alice's own" })).id;
  });

  it("lists only the caller's own instruments", async () => {
    const res = await list(await apiRequest("/api/v1/instruments", { userId: bob.user.id }));
    expect(res.status).toBe(200);
    const { data } = await res.json();
    expect(data.every((i: { observerId: string }) => i.observerId === bob.observer!.id)).toBe(true);
    expect(data.map((i: { id: string }) => i.id)).not.toContain(alicesId);
    // A stray ?observerId= does not widen an observer's view.
    const probing = await list(
      await apiRequest(`/api/v1/instruments?observerId=${alice.observer!.id}`, { userId: bob.user.id }),
    );
    expect((await probing.json()).data.map((i: { id: string }) => i.id)).not.toContain(alicesId);
  });

  it("answers 404 to another observer for read, edit, archive and delete, and changes nothing", async () => {
    const before = await readRow(alicesId);
    const asBob = { userId: bob.user.id };
    expect((await getOne(await apiRequest("/x", asBob), ctx(alicesId))).status).toBe(404);
    expect((await put(alicesId, mirror({ name: "Mine now" }), bob.user.id)).status).toBe(404);
    expect((await archive(await apiRequest("/x", { ...asBob, method: "POST" }), ctx(alicesId))).status).toBe(
      404,
    );
    expect(
      (await restore(await apiRequest("/x", { ...asBob, method: "DELETE" }), ctx(alicesId))).status,
    ).toBe(404);
    expect(
      (await removeOne(await apiRequest("/x", { ...asBob, method: "DELETE" }), ctx(alicesId))).status,
    ).toBe(404);
    expect(await readRow(alicesId)).toEqual(before);
  });

  it("lets a coordinator read any observer's list and instruments, but not change them", async () => {
    const asCoordinator = { userId: coordinator.user.id };
    const res = await list(
      await apiRequest(`/api/v1/instruments?observerId=${alice.observer!.id}`, asCoordinator),
    );
    expect(res.status).toBe(200);
    expect((await res.json()).data.map((i: { id: string }) => i.id)).toContain(alicesId);
    const one = await getOne(await apiRequest("/x", asCoordinator), ctx(alicesId));
    expect(one.status).toBe(200);
    expect((await one.json()).name).toBe("Alice's own");

    expect((await list(await apiRequest("/api/v1/instruments", asCoordinator))).status).toBe(400);
    const before = await countInstruments();
    expect((await post(mirror(), coordinator.user.id)).status).toBe(403);
    expect((await put(alicesId, mirror({ name: "Coordinated" }), coordinator.user.id)).status).toBe(403);
    expect(
      (await archive(await apiRequest("/x", { ...asCoordinator, method: "POST" }), ctx(alicesId))).status,
    ).toBe(403);
    expect(
      (await removeOne(await apiRequest("/x", { ...asCoordinator, method: "DELETE" }), ctx(alicesId))).status,
    ).toBe(403);
    expect(await countInstruments()).toBe(before);
    expect((await readRow(alicesId))?.name).toBe("Alice's own");
  });

  it("refuses educators (403) and anonymous callers (401)", async () => {
    const asEducator = { userId: educator.user.id };
    expect(
      (await list(await apiRequest(`/api/v1/instruments?observerId=${alice.observer!.id}`, asEducator)))
        .status,
    ).toBe(403);
    expect((await getOne(await apiRequest("/x", asEducator), ctx(alicesId))).status).toBe(403);
    expect((await post(mirror(), educator.user.id)).status).toBe(403);
    expect((await list(await apiRequest("/api/v1/instruments"))).status).toBe(401);
    expect((await post(mirror(), undefined)).status).toBe(401);
  });

  it("shows k for this instrument once one is computed for it", async () => {
    await getDb()
      .insert(kCoefficients)
      .values([
        {
          observerId: alice.observer!.id,
          instrumentId: alicesId,
          periodStart: "2025-01-01",
          periodEnd: "2025-12-31",
          k: 0.83,
          sigma: 0.04,
          commonDays: 120,
          method: "ratio-of-sums",
          reference: "test",
        },
        // An observer-wide k is not this instrument's k.
        {
          observerId: alice.observer!.id,
          periodStart: "2026-01-01",
          periodEnd: "2026-03-31",
          k: 1.2,
          commonDays: 40,
          method: "ratio-of-sums",
          reference: "test",
        },
      ]);
    const res = await getOne(await apiRequest("/x", { userId: alice.user.id }), ctx(alicesId));
    expect((await res.json()).k).toEqual({
      k: 0.83,
      sigma: 0.04,
      periodStart: "2025-01-01",
      periodEnd: "2025-12-31",
    });
    const other = await createMirror(alice.user.id);
    const res2 = await getOne(await apiRequest("/x", { userId: alice.user.id }), ctx(other.id));
    expect((await res2.json()).k).toBeNull();
  });
});

describe("the unit preference", () => {
  async function unitSystemOf(made: Made) {
    const [row] = await getDb()
      .select({ unitSystem: observers.unitSystem })
      .from(observers)
      .where(eq(observers.id, made.observer!.id));
    return row?.unitSystem;
  }

  beforeEach(() => {
    context.cookie = "";
  });

  it("is saved for the caller only", async () => {
    context.cookie = await sessionCookie(alice.user.id);
    expect(await unitSystemOf(alice)).toBe("metric");
    const result = await setUnitSystemAction({ unitSystem: "imperial" });
    expect(result).toMatchObject({ ok: true });
    expect(await unitSystemOf(alice)).toBe("imperial");
    expect(await unitSystemOf(bob)).toBe("metric");
    await setUnitSystemAction({ unitSystem: "metric" });
    expect(await unitSystemOf(alice)).toBe("metric");
  });

  it("refuses an unknown unit system and changes nothing", async () => {
    context.cookie = await sessionCookie(alice.user.id);
    const result = await setUnitSystemAction({ unitSystem: "furlongs" });
    expect(result.ok).toBe(false);
    expect(result.fieldErrors?.unitSystem).toMatch(/metric or imperial/);
    expect(await unitSystemOf(alice)).toBe("metric");
  });

  it("refuses callers without a Logbook, and anonymous ones", async () => {
    context.cookie = await sessionCookie(educator.user.id);
    expect(await setUnitSystemAction({ unitSystem: "imperial" })).toMatchObject({ ok: false });
    context.cookie = "";
    expect(await setUnitSystemAction({ unitSystem: "imperial" })).toMatchObject({
      ok: false,
      message: /Sign in/,
    });
  });
});
