/**
 * Sends a few hundred randomly corrupted payloads to each write route of the
 * public API and checks that every answer is a 4xx with the error shape and
 * that the database is exactly as it was. The generator is seeded, so a
 * failure names a case that can be replayed. Every corruption is chosen to
 * make the request invalid (a corruption that might leave it valid, such as
 * deleting an optional field, is never used alone).
 */
import { and, count, eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";

import { PUT as putObservation } from "@/app/api/v1/observations/[id]/route";
import { POST as postObservation } from "@/app/api/v1/observations/route";
import { POST as postImport } from "@/app/api/v1/imports/route";
import { getDb } from "@/db/client";
import { insertApiToken } from "@/db/queries/api-tokens";
import { apiTokens, observations } from "@/db/schema";
import { generateApiToken } from "@/lib/auth/api-token";
import { resetEnvCache } from "@/lib/env";
import { DEFAULT_MAX_BODY_BYTES } from "@/lib/http/read-json";

import {
  buildJsonCase,
  createRandom,
  expectRefusal,
  fingerprintDatabase,
  idempotencyHeader,
  type Random,
} from "./fuzz-support";
import { makeUser, sessionCookie } from "./support";

process.env.API_RATE_LIMIT_PER_MINUTE = "100000";
resetEnvCache();

const CASES_PER_ROUTE = 300;
const SEED = 20_260_314;

type Made = Awaited<ReturnType<typeof makeUser>>;
let alice: Made;
let bob: Made;
let ownObservationId: string;
let bobObservationId: string;
let token: string;

const validObservation = () => ({
  observedAt: "2025-09-01T09:30:00Z",
  seeing: 2,
  instrumentId: alice.instrument!.id,
  groups: 3,
  spots: 17,
  northGroups: 2,
  northSpots: 11,
  southGroups: 1,
  southSpots: 6,
  notes: "clear",
});

const REQUIRED = ["observedAt", "seeing", "instrumentId", "groups", "spots"] as const;
const COUNTS = [
  "seeing",
  "groups",
  "spots",
  "northGroups",
  "northSpots",
  "southGroups",
  "southSpots",
] as const;
const BAD_NUMBERS: unknown[] = [-1, -0.5, 2.5, 1e9, "abc", "NaN", "Infinity", true, {}, [], "1e400", " -3 "];
const BAD_TIMES: unknown[] = [
  "2999-01-01T00:00:00Z",
  "1600-01-01T00:00:00Z",
  "yesterday",
  "2025-13-01T00:00:00Z",
  1756719000000,
  "",
  null,
  "2025-09-01",
];

/** One change that makes an observation invalid, applied to a copy. */
function corruptObservation(
  random: Random,
  body: Record<string, unknown>,
): Record<string, unknown> | unknown {
  const kind = random.int(0, 9);
  switch (kind) {
    case 0:
      delete body[random.pick(REQUIRED)];
      return body;
    case 1:
      body[random.pick(COUNTS)] = random.pick(BAD_NUMBERS);
      return body;
    case 2:
      body.observedAt = random.pick(BAD_TIMES);
      return body;
    case 3: {
      // s < g, or spots without groups (with the hemispheres left out so they cannot mask it).
      for (const k of ["northGroups", "northSpots", "southGroups", "southSpots"]) delete body[k];
      if (random.next() < 0.5) Object.assign(body, { groups: random.int(2, 20), spots: 1 });
      else Object.assign(body, { groups: 0, spots: random.int(1, 50) });
      return body;
    }
    case 4: {
      // Hemisphere counts: some but not all, or not adding up.
      if (random.next() < 0.5)
        delete body[random.pick(["northGroups", "northSpots", "southGroups", "southSpots"])];
      else body.northSpots = (body.northSpots as number) + random.int(1, 5);
      return body;
    }
    case 5:
      body[random.pick(["color", "observer", "status", "source", "k", "__proto__x"])] = random.int(0, 9);
      return body;
    case 6:
      body.instrumentId = random.pick([bob.instrument!.id, "no-such-instrument", "x".repeat(65), "", 42]);
      return body;
    case 7:
      body.notes = "n".repeat(2001 + random.int(0, 500));
      return body;
    case 8:
      return random.pick([[body], 42, "observation", null, true]);
    default:
      return random.pick([undefined, {}, { groups: 1 }]);
  }
}

function authHeaders(
  random: Random,
  userId: string,
): Promise<Record<string, string>> | Record<string, string> {
  return random.next() < 0.3
    ? { authorization: `Bearer ${token}` }
    : sessionCookie(userId).then((c) => ({ cookie: c }));
}

const buildObservationCase = (random: Random) =>
  buildJsonCase(random, {
    valid: validObservation,
    corrupt: corruptObservation,
    maxBytes: DEFAULT_MAX_BODY_BYTES,
  });

beforeAll(async () => {
  alice = await makeUser({ role: "observer", name: "Alice" });
  bob = await makeUser({ role: "observer", name: "Bob" });
  const db = getDb();
  const [own] = await db
    .insert(observations)
    .values({
      observerId: alice.observer!.id,
      instrumentId: alice.instrument!.id,
      observedAt: new Date("2025-08-01T09:00:00Z"),
      utDate: "2025-08-01",
      seeing: 2,
      groups: 1,
      spots: 3,
    })
    .returning();
  ownObservationId = own!.id;
  const [bobs] = await db
    .insert(observations)
    .values({
      observerId: bob.observer!.id,
      instrumentId: bob.instrument!.id,
      observedAt: new Date("2025-08-01T09:00:00Z"),
      utDate: "2025-08-01",
      seeing: 2,
      groups: 1,
      spots: 3,
    })
    .returning();
  bobObservationId = bobs!.id;
  const minted = generateApiToken();
  await insertApiToken({
    userId: alice.user.id,
    name: "fuzz",
    scope: "read-submit",
    prefix: minted.prefix,
    tokenHash: minted.tokenHash,
  });
  token = minted.token;
});

let before: Record<string, string>;
beforeAll(async () => {
  before = await fingerprintDatabase();
});

afterAll(async () => {
  // Nothing was stored anywhere: same rows, same content, in every table.
  expect(await fingerprintDatabase()).toEqual(before);
});

describe("fuzzing the write routes", () => {
  it(`POST /api/v1/observations refuses ${CASES_PER_ROUTE} corrupted payloads`, async () => {
    const random = createRandom(SEED);
    for (let i = 0; i < CASES_PER_ROUTE; i++) {
      const { text, contentType } = buildObservationCase(random);
      const headers = {
        ...(await authHeaders(random, alice.user.id)),
        ...idempotencyHeader(random),
        ...(contentType ? { "content-type": contentType } : {}),
      };
      const res = await postObservation(
        new Request("http://localhost:3999/api/v1/observations", {
          method: "POST",
          headers,
          body: text === "" ? undefined : text,
        }),
      );
      await expectRefusal(res, `POST case ${i}`);
    }
  });

  it(`PUT /api/v1/observations/{id} refuses ${CASES_PER_ROUTE} corrupted payloads`, async () => {
    const random = createRandom(SEED + 1);
    for (let i = 0; i < CASES_PER_ROUTE; i++) {
      // Now and then a valid body aimed at someone else's or a missing observation: 404.
      const target =
        random.next() < 0.15
          ? random.pick([bobObservationId, "no-such-id", "../../admin"])
          : ownObservationId;
      const { text, contentType } =
        target === ownObservationId
          ? buildObservationCase(random)
          : { text: JSON.stringify(validObservation()), contentType: "application/json" };
      const headers = {
        ...(await authHeaders(random, alice.user.id)),
        ...idempotencyHeader(random),
        ...(contentType ? { "content-type": contentType } : {}),
      };
      const res = await putObservation(
        new Request(`http://localhost:3999/api/v1/observations/${encodeURIComponent(target)}`, {
          method: "PUT",
          headers,
          body: text === "" ? undefined : text,
        }),
        { params: Promise.resolve({ id: target }) },
      );
      await expectRefusal(res, `PUT case ${i}`);
    }
  });

  it(`POST /api/v1/imports refuses ${CASES_PER_ROUTE} corrupted files and options`, async () => {
    const random = createRandom(SEED + 2);
    const goodLines = () => [
      "date,g,s,seeing,instrument,notes",
      "2012-05-01,2,9,2,Test pinhole,thin cloud",
      "2012-05-02,3,14,3,Test pinhole,",
      "2012-05-03,0,0,2,Test pinhole,spotless",
    ];
    const goodOptions = () =>
      ({
        date: "1",
        groups: "2",
        spots: "3",
        seeing: "4",
        instrument: "5",
        notes: "6",
        dateFormat: "yyyy-mm-dd",
        timeZone: "UTC",
      }) as Record<string, string>;
    const BAD_ROWS = [
      "2012-02-30,1,2,2,Test pinhole,",
      "3012-05-09,1,2,2,Test pinhole,",
      "2012-05-09,1.5,2,2,Test pinhole,",
      "2012-05-09,-1,2,2,Test pinhole,",
      "2012-05-09,4,2,2,Test pinhole,",
      "2012-05-09,0,3,2,Test pinhole,",
      "2012-05-01,1,2,2,Test pinhole,",
      "2012-05-09,1,2,2,Big reflector,",
      "2012-05-09,1,2,9,Test pinhole,",
      "2012-05-09,one,2,2,Test pinhole,",
      "2012-05-09,,,2,Test pinhole,",
    ];
    for (let i = 0; i < CASES_PER_ROUTE; i++) {
      const lines = goodLines();
      const options = goodOptions();
      let body: string | Uint8Array = "";
      let contentType = "text/csv";
      const extraHeaders: Record<string, string> = {};
      let streamed = false;
      const kind = random.int(0, 7);
      switch (kind) {
        case 0:
        case 1:
          lines.splice(random.int(1, lines.length), 0, random.pick(BAD_ROWS));
          break;
        case 2:
          lines.splice(
            random.int(1, lines.length),
            0,
            `2012-05-1${random.int(0, 9)},1,2,2,Test pinhole,"never closed`,
          );
          break;
        case 3: {
          const field = random.pick([
            "date",
            "groups",
            "spots",
            "dateFormat",
            "timeZone",
            "delimiter",
            "header",
            "unknown",
            "defaultTime",
          ]);
          options[field] = random.pick([
            "",
            "0",
            "201",
            "x",
            "7",
            "Mars/Olympus",
            "dd/mm/yy",
            "semicolon",
            "maybe",
            "25:00",
          ]);
          if (field === "date" || field === "groups" || field === "spots") {
            // Missing, out of range, not a number, or the column of another field.
            if (random.next() < 0.5) delete options[field];
            else options[field] = random.pick(["0", "201", "x", "-1", "1.5", "4", "5", "6"]);
          }
          break;
        }
        case 4:
          for (let k = 0; k < lines.length; k++) lines[k] = lines[k]!.replaceAll(",", ";");
          break;
        case 5:
          body = random.pick([
            new Uint8Array([0x50, 0x4b, 0x03, 0x04, 1, 2, 3]),
            new Uint8Array(Array.from({ length: 64 }, () => random.int(0, 255)).concat([0])),
            new Uint8Array(0),
            new TextEncoder().encode(lines[0]!),
          ]);
          break;
        case 6:
          contentType = random.pick(["application/json", "image/png", "multipart/form-data; boundary=x"]);
          break;
        default:
          // A declared size over the limit; the body is a stream, since a
          // text body would have its Content-Length recomputed.
          extraHeaders["content-length"] = String(random.int(33, 400) * 1024 * 1024);
          streamed = true;
      }
      if (body === "") body = lines.join(random.pick(["\n", "\r\n"]));
      const query = new URLSearchParams(options).toString();
      const headers = {
        ...(await authHeaders(random, alice.user.id)),
        ...idempotencyHeader(random),
        "content-type": contentType,
        ...extraHeaders,
      };
      const payload = typeof body === "string" ? new TextEncoder().encode(body) : body;
      const res = await postImport(
        new Request(`http://localhost:3999/api/v1/imports?${query}`, {
          method: "POST",
          headers,
          body: streamed
            ? new ReadableStream<Uint8Array>({
                start(controller) {
                  controller.enqueue(payload);
                  controller.close();
                },
              })
            : payload.length
              ? Buffer.from(payload)
              : undefined,
          duplex: "half",
        } as RequestInit),
      );
      await expectRefusal(
        res,
        `import case ${i}, kind ${kind} (${query}, ${contentType}, ${JSON.stringify(extraHeaders)})`,
      );
    }
  });

  it("left no observations behind for either observer", async () => {
    const [row] = await getDb()
      .select({ n: count() })
      .from(observations)
      .where(and(eq(observations.observerId, alice.observer!.id)));
    expect(row!.n).toBe(1);
    const tokens = await getDb().select().from(apiTokens).where(eq(apiTokens.userId, alice.user.id));
    expect(tokens).toHaveLength(1);
  });
});
