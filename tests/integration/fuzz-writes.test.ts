/**
 * Issue 8, continued: randomly corrupted payloads sent to the JSON write
 * routes beyond observations and imports (instruments, review decisions,
 * tracings, k settings, reference series, class-session counts), each by a
 * caller allowed to use the route, so every refusal comes from validation
 * and not from the guard. Every answer must be a 4xx with the error shape,
 * and the database must be exactly as it was. Seeded: a failure names a case
 * that can be replayed. Every corruption makes the request invalid on its
 * own (a change that might leave it valid is never used alone).
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";

import { PUT as putKSettings } from "@/app/api/v1/k-settings/route";
import { POST as postSessionCount } from "@/app/api/v1/classroom-sessions/[id]/observations/route";
import { DELETE as deleteInstrument, PUT as putInstrument } from "@/app/api/v1/instruments/[id]/route";
import {
  DELETE as unarchiveInstrument,
  POST as archiveInstrument,
} from "@/app/api/v1/instruments/[id]/archive/route";
import { POST as postInstrument } from "@/app/api/v1/instruments/route";
import { PUT as putTracing } from "@/app/api/v1/observations/[id]/tracing/route";
import { DELETE as deletePhoto } from "@/app/api/v1/photos/[id]/route";
import { POST as postReferenceSeries } from "@/app/api/v1/reference-series/route";
import { POST as postReviewDecision } from "@/app/api/v1/review/decisions/route";
import { getDb } from "@/db/client";
import { classroomSessions, observations } from "@/db/schema";
import { DEFAULT_MAX_BODY_BYTES } from "@/lib/http/read-json";
import { instrumentInputSchema } from "@/lib/validation/instrument";
import { DEFAULT_K_SETTINGS, kSettingsSchema } from "@/lib/validation/k-settings";
import { observationInputSchema } from "@/lib/validation/observation";
import { MAX_REFERENCE_CSV_BYTES, referenceImportSchema } from "@/lib/validation/reference-import";
import { reviewDecisionSchema } from "@/lib/validation/review";
import {
  checkTracingDocument,
  createEmptyTracing,
  MAX_SAVE_REQUEST_BYTES,
  saveTracingRequestSchema,
} from "@/lib/validation/tracing";

import {
  buildJsonCase,
  buildJsonRequest,
  createRandom,
  expectRefusal,
  fingerprintDatabase,
  idempotencyHeader,
  type Random,
} from "./fuzz-support";
import { enrolStudent, makeUser } from "./support";

// Enough to reach every corruption kind many times over, small enough that
// the file runs in seconds.
const CASES_PER_ROUTE = 150;
const SEED = 20_260_402;

type Made = Awaited<ReturnType<typeof makeUser>>;
let alice: Made;
let bob: Made;
let coordinator: Made;
let student: Made;
let aliceObservationId: string;
let bobObservationId: string;
let sessionId: string;
let otherSessionId: string;

type Context = { params: Promise<{ id: string }> };
type Handler = (request: Request, context: Context) => Promise<Response>;
const withId = (id: string): Context => ({ params: Promise.resolve({ id }) });

/** Sends CASES_PER_ROUTE corrupted bodies to one route and checks each refusal. */
async function fuzzRoute({
  label,
  seed,
  method,
  userId,
  handler,
  valid,
  corrupt,
  maxBytes = DEFAULT_MAX_BODY_BYTES,
  target,
}: {
  label: string;
  seed: number;
  method: string;
  userId: () => string;
  handler: Handler;
  valid: () => Record<string, unknown>;
  corrupt: (random: Random, body: Record<string, unknown>) => unknown;
  maxBytes?: number;
  /** Path and id for each case; a valid body is sent when the id is not the caller's. */
  target?: (random: Random) => { path: string; id: string; foreign: boolean };
}) {
  const random = createRandom(seed);
  const codes = new Map<string, number>();
  for (let i = 0; i < CASES_PER_ROUTE; i++) {
    const aim = target?.(random) ?? { path: "", id: "", foreign: false };
    const { text, contentType } = aim.foreign
      ? { text: JSON.stringify(valid()), contentType: "application/json" }
      : buildJsonCase(random, { valid, corrupt, maxBytes });
    const request = await buildJsonRequest({
      url: aim.path,
      method,
      userId: userId(),
      text,
      contentType,
      headers: idempotencyHeader(random),
    });
    const res = await handler(request, withId(aim.id));
    const code = await expectRefusal(res, `${label} case ${i} (${text.slice(0, 120)})`);
    codes.set(code, (codes.get(code) ?? 0) + 1);
  }
  // The caller may use the route, so refusals come from the checks, never the guard.
  expect(codes.get("unauthenticated") ?? 0, label).toBe(0);
  expect(codes.get("forbidden") ?? 0, label).toBe(0);
  expect(codes.get("invalid_input") ?? 0, label).toBeGreaterThan(CASES_PER_ROUTE / 4);
  expect(codes.get("invalid_json") ?? 0, label).toBeGreaterThan(0);
}

const NOT_AN_OBJECT: unknown[] = [[], 42, "text", null, true];

// ---------------------------------------------------------------------------
// Instruments
// ---------------------------------------------------------------------------

const validPinhole = () => ({
  kind: "pinhole",
  name: "Shoebox pinhole",
  holeDiameterMm: 1,
  boxLengthMm: 1000,
  notes: "card tube",
});

function corruptInstrument(random: Random, body: Record<string, unknown>): unknown {
  switch (random.int(0, 8)) {
    case 0:
      delete body[random.pick(["kind", "name", "holeDiameterMm", "boxLengthMm"])];
      return body;
    case 1:
      body.holeDiameterMm = random.pick([-1, 0, 51, "abc", {}, [], "", null, "1e400", " -3 ", "NaN"]);
      return body;
    case 2:
      // Too long for a pinhole box, or shorter than ten hole diameters.
      body.boxLengthMm = random.pick([-1, 0, 100_001, "abc", 5, "9"]);
      return body;
    case 3:
      body.kind = random.pick(["telescope", "", 3, null, "PINHOLE"]);
      return body;
    case 4:
      // Another kind: the pinhole's fields do not describe it.
      body.kind = random.pick(["mirror", "eyepiece-projection", "camera", "filtered-telescope"]);
      return body;
    case 5:
      body.name = random.pick(["", "   ", 42, null, "n".repeat(81)]);
      return body;
    case 6:
      if (random.next() < 0.5) body.notes = "n".repeat(2001 + random.int(0, 300));
      else body.unitSystem = random.pick(["cubits", 1, "METRIC"]);
      return body;
    case 7:
      return random.pick(NOT_AN_OBJECT);
    default:
      return random.pick([undefined, {}, { kind: "pinhole" }]);
  }
}

// ---------------------------------------------------------------------------
// Review decisions
// ---------------------------------------------------------------------------

const validDecision = () => ({ action: "accept", observationIds: [aliceObservationId] });

function corruptDecision(random: Random, body: Record<string, unknown>): unknown {
  switch (random.int(0, 7)) {
    case 0:
      delete body[random.pick(["action", "observationIds"])];
      return body;
    case 1:
      body.action = random.pick(["approve", "", 1, null, "ACCEPT"]);
      return body;
    case 2:
      body.observationIds = random.pick([
        [],
        "one",
        [42],
        [""],
        ["x".repeat(65)],
        Array.from({ length: 201 }, (_, k) => `id-${k}`),
        null,
      ]);
      return body;
    case 3:
      // Query, reject and reopen must say why.
      body.action = random.pick(["query", "reject", "reopen"]);
      body.note = random.pick([undefined, "", "   ", null]);
      return body;
    case 4:
      body.note = random.pick([42, ["why"], "n".repeat(2001)]);
      return body;
    case 5:
      body[random.pick(["status", "decidedBy", "observationId"])] = "accepted";
      return body;
    case 6:
      return random.pick(NOT_AN_OBJECT);
    default:
      // Well formed, but nothing the coordinator can decide on.
      body.observationIds = [random.pick(["no-such-observation", "../../admin"])];
      return body;
  }
}

// ---------------------------------------------------------------------------
// Tracings
// ---------------------------------------------------------------------------

const validTracing = () =>
  ({ document: createEmptyTracing(), baseRevision: 0 }) as Record<string, unknown> & {
    document: Record<string, unknown>;
  };

const goodSpot = { id: "s1", x: 500, y: 500, umbraRadius: 3, penumbraRadius: 6, groupId: null, area: null };
const goodGroup = { id: "g1", number: 1, zurichClass: "C", mcintoshClass: "Dai", area: null };
const nullCounts = { northGroups: null, northSpots: null, southGroups: null, southSpots: null };

function corruptTracing(random: Random, raw: Record<string, unknown>): unknown {
  const body = raw as ReturnType<typeof validTracing>;
  const doc = body.document;
  switch (random.int(0, 9)) {
    case 0:
      if (random.next() < 0.3) delete body.baseRevision;
      else body.baseRevision = random.pick([-1, 1.5, "0", null, true, 7]);
      return body;
    case 1:
      body.document = random.pick([null, 42, "tracing", [], {}]) as Record<string, unknown>;
      return body;
    case 2:
      if (random.next() < 0.5) doc.format = random.pick(["svg", "", 1]);
      else doc.version = random.pick([0, 2, "1", null]);
      return body;
    case 3:
      doc.canvas = { width: random.pick([50, 20_001, 1.5, "1000"]), height: 1000 };
      return body;
    case 4:
      doc.spots = [
        random.pick([
          { ...goodSpot, id: "a b" },
          { ...goodSpot, umbraRadius: -1 },
          { ...goodSpot, groupId: "no-group" },
          { ...goodSpot, penumbraRadius: 1 },
          { ...goodSpot, x: 1e9 },
          { ...goodSpot, colour: "red" },
        ]),
      ];
      return body;
    case 5:
      doc.groups = random.pick([
        [{ ...goodGroup, number: 0 }],
        [{ ...goodGroup, mcintoshClass: "Xyz" }],
        [{ ...goodGroup, zurichClass: "Q" }],
        [goodGroup, { ...goodGroup }],
      ]);
      return body;
    case 6:
      body.png = random.pick(["data:image/gif;base64,AAAA", "not a picture", 42, "data:image/png;base64,!!"]);
      return body;
    case 7:
      body.counts = random.pick([
        { groups: -1, spots: 0, ...nullCounts },
        { groups: 1.5, spots: 2, ...nullCounts },
        { groups: 1, spots: 2 },
        { groups: 1, spots: 2, ...nullCounts, k: 1 },
        // Fewer spots than groups, or hemispheres that do not add up.
        { groups: 2, spots: 1, ...nullCounts },
        { groups: 1, spots: 2, northGroups: 1, northSpots: 1, southGroups: 0, southSpots: 0 },
      ]);
      return body;
    case 8:
      if (random.next() < 0.5) body.observationId = bobObservationId;
      else doc.layers = [];
      return body;
    default:
      return random.pick([...NOT_AN_OBJECT, undefined, {}]);
  }
}

// ---------------------------------------------------------------------------
// k settings
// ---------------------------------------------------------------------------

const validKSettings = () => ({ ...DEFAULT_K_SETTINGS }) as Record<string, unknown>;

function corruptKSettings(random: Random, body: Record<string, unknown>): unknown {
  switch (random.int(0, 8)) {
    case 0:
      delete body[
        random.pick(["periodKind", "method", "minCommonDays", "referenceSeriesId", "pilotK", "driftFraction"])
      ];
      return body;
    case 1:
      body.periodKind = random.pick(["month", "", 4, null]);
      return body;
    case 2:
      body.method = random.pick(["mean", "ratio of sums", 0, null]);
      return body;
    case 3:
      body.minCommonDays = random.pick([1, 367, 2.5, "x", true, null, "1e400"]);
      return body;
    case 4:
      body[random.pick(["pilotK", "driftFraction"])] = random.pick([0, 11, -1, "abc", true, "NaN", null, {}]);
      return body;
    case 5:
      // Well formed, but naming nothing that exists.
      if (random.next() < 0.5) body.referenceSeriesId = random.pick(["no-such-series", "", "x".repeat(65)]);
      else body.pilotObserverId = random.pick(["no-such-observer", "x".repeat(65), 42]);
      return body;
    case 6:
      body[random.pick(["k", "recomputeNow", "__proto__x"])] = 1;
      return body;
    case 7:
      return random.pick(NOT_AN_OBJECT);
    default:
      return random.pick([undefined, {}, { periodKind: "year" }]);
  }
}

// ---------------------------------------------------------------------------
// Reference series
// ---------------------------------------------------------------------------

const goodCsvLines = () => ["date,value", "2020-01-01,5", "2020-01-02,7.5", "2020-01-03,0"];
const validReference = () => ({
  name: "Test reference",
  licence: "CC BY 4.0",
  source: "made up for a test",
  csv: goodCsvLines().join("\n"),
});

function corruptReference(random: Random, body: Record<string, unknown>): unknown {
  switch (random.int(0, 7)) {
    case 0:
    case 1: {
      const lines = goodCsvLines();
      lines.splice(
        random.int(1, lines.length),
        0,
        random.pick([
          "2020-02-30,5",
          "2020-01-01,6",
          "2020-01-09,-3",
          "2020-01-09,NaN",
          "2020-01-09,1 000",
          "2020-01-09,",
          ",5",
          "2020-01-09,5,6",
          '"2020-01-09,5',
          "",
          "09/01/2020,5",
        ]),
      );
      body.csv = lines.join(random.pick(["\n", "\r\n"]));
      return body;
    }
    case 2:
      body.csv = random.pick(["", "date,value", "day,count\n2020-01-01,5", "value\n5", 42, null]);
      return body;
    case 3:
      delete body[random.pick(["name", "licence", "csv"])];
      return body;
    case 4:
      body[random.pick(["name", "licence", "source"])] = random.pick(["n".repeat(301), 42, ["x"]]);
      if (body.source === undefined) body.name = "";
      return body;
    case 5:
      body[random.pick(["firstDay", "values", "importedBy"])] = "2020-01-01";
      return body;
    case 6:
      return random.pick(NOT_AN_OBJECT);
    default:
      return random.pick([undefined, {}, { name: "x", licence: "y" }]);
  }
}

// ---------------------------------------------------------------------------
// A student's count for a class session
// ---------------------------------------------------------------------------

const tenMinutesAgo = () => new Date(Date.now() - 10 * 60 * 1000).toISOString();
const validSessionCount = () => ({
  observedAt: tenMinutesAgo(),
  seeing: 2,
  instrumentId: student.instrument!.id,
  groups: 3,
  spots: 17,
  northGroups: 2,
  northSpots: 11,
  southGroups: 1,
  southSpots: 6,
  notes: "class count",
});

function corruptSessionCount(random: Random, body: Record<string, unknown>): unknown {
  switch (random.int(0, 8)) {
    case 0:
      delete body[random.pick(["observedAt", "seeing", "instrumentId", "groups", "spots"])];
      return body;
    case 1:
      body[random.pick(["seeing", "groups", "spots", "northGroups", "southSpots"])] = random.pick([
        -1,
        -0.5,
        2.5,
        1e9,
        "abc",
        "NaN",
        "Infinity",
        true,
        {},
        [],
        "1e400",
        " -3 ",
      ]);
      return body;
    case 2:
      // Malformed, or well formed but outside the session's window.
      body.observedAt = random.pick([
        "2999-01-01T00:00:00Z",
        "yesterday",
        "",
        null,
        1756719000000,
        "2025-09-01T09:30:00Z",
        new Date(Date.now() - 3 * 60 * 60 * 1000).toISOString(),
      ]);
      return body;
    case 3:
      for (const k of ["northGroups", "northSpots", "southGroups", "southSpots"]) delete body[k];
      if (random.next() < 0.5) Object.assign(body, { groups: random.int(2, 20), spots: 1 });
      else Object.assign(body, { groups: 0, spots: random.int(1, 50) });
      return body;
    case 4:
      if (random.next() < 0.5)
        delete body[random.pick(["northGroups", "northSpots", "southGroups", "southSpots"])];
      else body.northSpots = (body.northSpots as number) + random.int(1, 5);
      return body;
    case 5:
      // The session picks the instrument, so only ids the schema itself refuses.
      body.instrumentId = random.pick(["", "   ", 42, "x".repeat(65), null]);
      return body;
    case 6:
      body[random.pick(["classroomId", "status", "observerId"])] = "x";
      return body;
    case 7:
      body.notes = "n".repeat(2001 + random.int(0, 300));
      return body;
    default:
      return random.pick([...NOT_AN_OBJECT, undefined, {}]);
  }
}

// ---------------------------------------------------------------------------

beforeAll(async () => {
  alice = await makeUser({ role: "observer", name: "Alice" });
  bob = await makeUser({ role: "observer", name: "Bob" });
  coordinator = await makeUser({ role: "coordinator" });
  const educator = await makeUser({ role: "educator" });
  student = await makeUser({ role: "student" });
  const otherEducator = await makeUser({ role: "educator" });
  const otherStudent = await makeUser({ role: "student" });
  const db = getDb();
  const observation = (who: Made) => ({
    observerId: who.observer!.id,
    instrumentId: who.instrument!.id,
    observedAt: new Date("2025-08-01T09:00:00Z"),
    utDate: "2025-08-01",
    seeing: 2,
    groups: 1,
    spots: 3,
  });
  const [own] = await db.insert(observations).values(observation(alice)).returning();
  aliceObservationId = own!.id;
  const [bobs] = await db.insert(observations).values(observation(bob)).returning();
  bobObservationId = bobs!.id;

  const room = await enrolStudent({ educatorUserId: educator.user.id, studentUserId: student.user.id });
  const otherRoom = await enrolStudent({
    educatorUserId: otherEducator.user.id,
    studentUserId: otherStudent.user.id,
  });
  const now = Date.now();
  const openSession = (classroomId: string) => ({
    classroomId,
    title: "Morning count",
    day: new Date(now).toISOString().slice(0, 10),
    opensAt: new Date(now - 60 * 60 * 1000),
    closesAt: new Date(now + 60 * 60 * 1000),
    instrumentName: "Class pinhole",
    instrumentKind: "pinhole" as const,
  });
  const [session] = await db.insert(classroomSessions).values(openSession(room.id)).returning();
  sessionId = session!.id;
  const [other] = await db.insert(classroomSessions).values(openSession(otherRoom.id)).returning();
  otherSessionId = other!.id;
});

let before: Record<string, string>;
beforeAll(async () => {
  before = await fingerprintDatabase();
});

afterAll(async () => {
  // Nothing was stored anywhere: same rows, same content, in every table.
  expect(await fingerprintDatabase()).toEqual(before);
});

describe("fuzzing the other write routes", () => {
  it("starts every route from a body its schema accepts, so each refusal is the corruption's doing", () => {
    expect(instrumentInputSchema.safeParse(validPinhole()).success).toBe(true);
    expect(reviewDecisionSchema.safeParse(validDecision()).success).toBe(true);
    const tracing = saveTracingRequestSchema.safeParse(validTracing());
    expect(tracing.success && checkTracingDocument(tracing.data.document).ok).toBe(true);
    expect(kSettingsSchema.safeParse(validKSettings()).success).toBe(true);
    expect(referenceImportSchema.safeParse(validReference()).success).toBe(true);
    expect(observationInputSchema.safeParse(validSessionCount()).success).toBe(true);
  });

  it(`POST /api/v1/instruments refuses ${CASES_PER_ROUTE} corrupted profiles`, async () => {
    await fuzzRoute({
      label: "POST instruments",
      seed: SEED,
      method: "POST",
      userId: () => alice.user.id,
      handler: (request) => postInstrument(request),
      valid: validPinhole,
      corrupt: corruptInstrument,
      target: () => ({ path: "/api/v1/instruments", id: "", foreign: false }),
    });
  });

  it(`PUT /api/v1/instruments/{id} refuses ${CASES_PER_ROUTE} corrupted profiles`, async () => {
    await fuzzRoute({
      label: "PUT instrument",
      seed: SEED + 1,
      method: "PUT",
      userId: () => alice.user.id,
      handler: putInstrument,
      valid: validPinhole,
      corrupt: corruptInstrument,
      target: (random) => {
        // Now and then a valid profile aimed at someone else's or a missing instrument: 404.
        const id =
          random.next() < 0.15
            ? random.pick([bob.instrument!.id, "no-such-id", "../../admin"])
            : alice.instrument!.id;
        return {
          path: `/api/v1/instruments/${encodeURIComponent(id)}`,
          id,
          foreign: id !== alice.instrument!.id,
        };
      },
    });
  });

  it(`POST /api/v1/review/decisions refuses ${CASES_PER_ROUTE} corrupted decisions`, async () => {
    await fuzzRoute({
      label: "POST review decision",
      seed: SEED + 2,
      method: "POST",
      userId: () => coordinator.user.id,
      handler: (request) => postReviewDecision(request),
      valid: validDecision,
      corrupt: corruptDecision,
      target: () => ({ path: "/api/v1/review/decisions", id: "", foreign: false }),
    });
  });

  it(`PUT /api/v1/observations/{id}/tracing refuses ${CASES_PER_ROUTE} corrupted tracings`, async () => {
    await fuzzRoute({
      label: "PUT tracing",
      seed: SEED + 3,
      method: "PUT",
      userId: () => alice.user.id,
      handler: putTracing,
      valid: validTracing,
      corrupt: corruptTracing,
      maxBytes: MAX_SAVE_REQUEST_BYTES,
      target: (random) => {
        const id = random.next() < 0.15 ? random.pick([bobObservationId, "no-such-id"]) : aliceObservationId;
        return {
          path: `/api/v1/observations/${encodeURIComponent(id)}/tracing`,
          id,
          foreign: id !== aliceObservationId,
        };
      },
    });
  });

  it(`PUT /api/v1/k-settings refuses ${CASES_PER_ROUTE} corrupted settings`, async () => {
    await fuzzRoute({
      label: "PUT k-settings",
      seed: SEED + 4,
      method: "PUT",
      userId: () => coordinator.user.id,
      handler: (request) => putKSettings(request),
      valid: validKSettings,
      corrupt: corruptKSettings,
      target: () => ({ path: "/api/v1/k-settings", id: "", foreign: false }),
    });
  });

  it(`POST /api/v1/reference-series refuses ${CASES_PER_ROUTE} corrupted series`, async () => {
    await fuzzRoute({
      label: "POST reference-series",
      seed: SEED + 5,
      method: "POST",
      userId: () => coordinator.user.id,
      handler: (request) => postReferenceSeries(request),
      valid: validReference,
      corrupt: corruptReference,
      maxBytes: MAX_REFERENCE_CSV_BYTES + 256 * 1024,
      target: () => ({ path: "/api/v1/reference-series", id: "", foreign: false }),
    });
  });

  it(`POST /api/v1/classroom-sessions/{id}/observations refuses ${CASES_PER_ROUTE} corrupted counts`, async () => {
    await fuzzRoute({
      label: "POST session count",
      seed: SEED + 6,
      method: "POST",
      userId: () => student.user.id,
      handler: postSessionCount,
      valid: validSessionCount,
      corrupt: corruptSessionCount,
      target: (random) => {
        // Now and then a valid count for another classroom's or a missing session: 404.
        const id = random.next() < 0.15 ? random.pick([otherSessionId, "no-such-session"]) : sessionId;
        return {
          path: `/api/v1/classroom-sessions/${encodeURIComponent(id)}/observations`,
          id,
          foreign: id !== sessionId,
        };
      },
    });
  });

  it("the bodiless instrument and photo writes refuse ids that are not the caller's", async () => {
    const random = createRandom(SEED + 7);
    const routes: Array<{ label: string; method: string; path: (id: string) => string; handler: Handler }> = [
      {
        label: "DELETE instrument",
        method: "DELETE",
        path: (id) => `/api/v1/instruments/${id}`,
        handler: deleteInstrument,
      },
      {
        label: "POST archive",
        method: "POST",
        path: (id) => `/api/v1/instruments/${id}/archive`,
        handler: archiveInstrument,
      },
      {
        label: "DELETE archive",
        method: "DELETE",
        path: (id) => `/api/v1/instruments/${id}/archive`,
        handler: unarchiveInstrument,
      },
      { label: "DELETE photo", method: "DELETE", path: (id) => `/api/v1/photos/${id}`, handler: deletePhoto },
    ];
    for (let i = 0; i < 40; i++) {
      const route = random.pick(routes);
      const id = random.pick([bob.instrument!.id, "no-such-id", "../../admin", "x".repeat(300), "%00", " "]);
      const request = await buildJsonRequest({
        url: route.path(encodeURIComponent(id)),
        method: route.method,
        userId: alice.user.id,
        text: "",
        contentType: "",
      });
      await expectRefusal(await route.handler(request, withId(id)), `${route.label} case ${i} (${id})`);
    }
    // Alice's own instrument is used by her observation: it can be archived, not deleted.
    const own = alice.instrument!.id;
    const request = await buildJsonRequest({
      url: `/api/v1/instruments/${own}`,
      method: "DELETE",
      userId: alice.user.id,
      text: "",
      contentType: "",
    });
    await expectRefusal(await deleteInstrument(request, withId(own)), "DELETE own instrument in use");
  });
});
