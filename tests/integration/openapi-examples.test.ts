/**
 * Runs the example of every documented route against its handler, signed as
 * the documented role with the documented token scope, and checks the
 * answer against the documented statuses and schemas. So the /api-docs page
 * cannot show an example that fails, a scope that is wrong, or an answer
 * shape the route does not give.
 */
import path from "node:path";

import { NextRequest } from "next/server";
import { afterAll, beforeAll, describe, expect, it } from "vitest";

import { getDb } from "@/db/client";
import { insertApiToken } from "@/db/queries/api-tokens";
import { createJob, getJob } from "@/db/queries/jobs";
import { classroomSessions, photos } from "@/db/schema";
import { API_ROUTES, type ApiRoute } from "@/lib/api/routes";
import { generateApiToken } from "@/lib/auth/api-token";
import type { Role } from "@/lib/auth/roles";
import { resetEnvCache } from "@/lib/env";
import { startMailSink } from "@/lib/mail/sink";

import { listApiRouteFiles, resolveRouteFile } from "./api-route-files";
import { startPhotoStore } from "./photo-store-support";
import { enrolStudent, insertInstrument, insertObservation, makeUser, sessionCookie } from "./support";

type Made = Awaited<ReturnType<typeof makeUser>>;
type Handler = (request: Request, context: { params: Promise<Record<string, string>> }) => Promise<Response>;

// The smallest valid PNG: signature, IHDR (1×1, grey), IDAT, IEND.
const TINY_PNG =
  "data:image/png;base64,iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAAAAAA6fptVAAAACklEQVR4nGNgAAAAAgABSK+kcQAAAABJRU5ErkJggg==";

let photoStore: Awaited<ReturnType<typeof startPhotoStore>>;
let sink: Awaited<ReturnType<typeof startMailSink>>;
const people = {} as Record<Role, Made>;
const tokens = {} as Record<string, { read: string; submit: string }>;
/** What each placeholder in the examples stands for here, and per operation where one would spoil another. */
let placeholders: Record<string, string>;
let perOperation: Record<string, Record<string, string>>;
/** Bodies that must name a time relative to now (a class session is open only for an hour or two). */
let bodies: Record<string, unknown>;

const findRoute = (operationId: string) => API_ROUTES.find((r) => r.operationId === operationId)!;

async function mintToken(userId: string, scope: "read" | "read-submit") {
  const minted = generateApiToken();
  await insertApiToken({ userId, name: scope, scope, prefix: minted.prefix, tokenHash: minted.tokenHash });
  return minted.token;
}

async function insertPhoto(observer: Made, observationId: string, key: string) {
  const [row] = await getDb()
    .insert(photos)
    .values({
      fileKey: key,
      observerId: observer.observer!.id,
      observationId,
      name: `${key}.jpg`,
      sizeBytes: 1234,
      mimeType: "image/jpeg",
      widthPx: 640,
      heightPx: 480,
      url: `https://example.test/${key}`,
    })
    .returning();
  return row!.id;
}

/** The role an example is run as: the first of the route's roles in this order. */
function callerOf(route: ApiRoute): Made | null {
  if (route.roles.length === 0) return null;
  const order: Role[] = ["observer", "coordinator", "educator", "student", "admin"];
  return people[order.find((role) => route.roles.includes(role))!];
}

function substitute<T>(value: T, operationId: string): T {
  if (value === undefined) return value;
  let text = JSON.stringify(value);
  for (const [placeholder, real] of Object.entries({ ...placeholders, ...perOperation[operationId] }))
    text = text.split(placeholder).join(real);
  return JSON.parse(text) as T;
}

async function callExample(
  route: ApiRoute,
  { token, body: bodyOverride }: { token?: "read" | "submit"; body?: unknown } = {},
) {
  const example = substitute(route.example, route.operationId);
  let urlPath = route.path;
  for (const [name, value] of Object.entries(example.pathParams ?? {}))
    urlPath = urlPath.replace(`{${name}}`, encodeURIComponent(value));
  const query = example.query ? `?${new URLSearchParams(example.query).toString()}` : "";
  const headers = new Headers();
  const caller = callerOf(route);
  if (caller && route.scope !== "none") {
    if (route.scope === "session") headers.set("cookie", await sessionCookie(caller.user.id));
    else {
      const scope = token ?? (route.scope === "read" ? "read" : "submit");
      headers.set("authorization", `Bearer ${tokens[caller.user.id]![scope]}`);
    }
  }
  if (route.idempotent) headers.set("idempotency-key", `example-${route.operationId}`);
  const body = substitute(bodyOverride ?? bodies[route.operationId], route.operationId) ?? example.body;
  let payload: string | undefined;
  if (route.body) {
    headers.set("content-type", route.body.contentType);
    payload = example.bodyText ?? JSON.stringify(body);
  }
  const resolved = resolveRouteFile(listApiRouteFiles(), urlPath);
  if (!resolved) throw new Error(`No route file serves ${urlPath}`);
  const routeModule = (await import(path.join(process.cwd(), resolved.route.file))) as Record<
    string,
    Handler
  >;
  const handler = routeModule[route.method.toUpperCase()]!;
  const request = new NextRequest(new URL(`${urlPath}${query}`, "http://localhost:3999"), {
    method: route.method.toUpperCase(),
    headers,
    body: payload,
  });
  return handler(request, { params: Promise.resolve(resolved.params) });
}

/** Whether a body could belong to any of the documented media types. */
const typeMatches = (contentType: string | null, documented: string[]) =>
  documented.some((t) => (contentType ?? "").split(";")[0]!.trim() === t);

beforeAll(async () => {
  photoStore = await startPhotoStore({ name: "examples" });
  sink = await startMailSink({ port: 0 });
  process.env.SMTP_PORT = String(sink.port);
  resetEnvCache();

  // One at a time: the helper numbers users from a shared counter.
  for (const role of ["observer", "coordinator", "educator", "student", "admin"] as const)
    people[role] = await makeUser({ role });
  for (const made of Object.values(people)) {
    if (made.user.role === "student") continue; // students cannot hold tokens
    tokens[made.user.id] = {
      read: await mintToken(made.user.id, "read"),
      submit: await mintToken(made.user.id, "read-submit"),
    };
  }
  const { observer, coordinator, educator, student } = people;
  const room = await enrolStudent({ educatorUserId: educator.user.id, studentUserId: student.user.id });
  const now = Date.now();
  const [session] = await getDb()
    .insert(classroomSessions)
    .values({
      classroomId: room.id,
      title: "Morning count",
      day: new Date(now).toISOString().slice(0, 10),
      opensAt: new Date(now - 3_600_000),
      closesAt: new Date(now + 3_600_000),
      instrumentName: "Class pinhole",
      instrumentKind: "pinhole",
    })
    .returning();
  const observationId = await insertObservation({ owner: observer, day: "2026-03-10", groups: 1, spots: 3 });
  const job = await createJob({ kind: "example", requestedByUserId: coordinator.user.id });

  placeholders = {
    "<observation id>": observationId,
    "<instrument id>": observer.instrument!.id,
    "<photo id>": await insertPhoto(observer, observationId, "example-photo"),
    "<job id>": job.id,
    "<observer id>": observer.observer!.id,
    "<classroom id>": room.id,
    "<session id>": session!.id,
  };
  perOperation = {
    saveTracing: {
      "<observation id>": await insertObservation({
        owner: observer,
        day: "2026-03-11",
        groups: 1,
        spots: 3,
      }),
    },
    deleteObservation: {
      "<observation id>": await insertObservation({
        owner: observer,
        day: "2026-03-12",
        groups: 1,
        spots: 3,
      }),
    },
    reviseInstrument: {
      "<instrument id>": await insertInstrument({ owner: observer, name: "Spare pinhole" }),
    },
    deleteInstrument: {
      "<instrument id>": await insertInstrument({ owner: observer, name: "Unused pinhole" }),
    },
    archiveInstrument: {
      "<instrument id>": await insertInstrument({ owner: observer, name: "Old pinhole" }),
    },
    importLogbook: {
      "<instrument id>": await insertInstrument({ owner: observer, name: "Imported pinhole" }),
    },
    deletePhoto: { "<photo id>": await insertPhoto(observer, observationId, "example-photo-2") },
  };
  perOperation.restoreInstrument = perOperation.archiveInstrument!;
  const sessionCount = findRoute("submitClassSessionCount").example.body as object;
  bodies = { submitClassSessionCount: { ...sessionCount, observedAt: new Date(now - 60_000).toISOString() } };

  // The tracing the read routes fetch, saved with its picture.
  const saveTracing = findRoute("saveTracing");
  const saved = await callExample(
    { ...saveTracing, operationId: "tracingFixture", idempotent: false },
    { body: { ...(saveTracing.example.body as object), png: TINY_PNG } },
  );
  expect(saved.status, await saved.clone().text()).toBe(200);
});

afterAll(async () => {
  await sink.close();
  await photoStore.stop();
});

describe("every documented example", () => {
  it("has a caller and a token scope the route really accepts", () => {
    for (const route of API_ROUTES) {
      if (route.scope === "none") expect(route.roles, route.operationId).toEqual([]);
      else expect(callerOf(route), route.operationId).not.toBeNull();
    }
  });

  it("is refused to a read-only token on every write, and nothing is stored", async () => {
    for (const route of API_ROUTES.filter((r) => r.scope === "read-submit")) {
      const res = await callExample(route, { token: "read" });
      expect(res.status, route.operationId).toBe(403);
      expect((await res.json()).error.code).toBe("forbidden");
    }
  });

  // One test per route, in the document's order, so a failure names it.
  for (const route of API_ROUTES) {
    it(`${route.method.toUpperCase()} ${route.path} (${route.operationId}) answers as documented`, async () => {
      const res = await callExample(route);
      const status = String(res.status);
      const documented = route.responses[Number(status)];
      const text = res.headers.get("content-type")?.startsWith("application/json")
        ? await res.clone().text()
        : "";
      expect(documented, `${route.operationId} answered ${status} ${text.slice(0, 400)}`).toBeDefined();
      for (const header of Object.keys(documented!.headers ?? {}))
        expect(res.headers.get(header), `${route.operationId} ${header}`).toBeTruthy();

      if (documented!.schema && typeMatches(res.headers.get("content-type"), ["application/json"])) {
        const parsed = documented!.schema.safeParse(await res.json());
        expect(parsed.success, `${route.operationId}: ${JSON.stringify(parsed.error?.issues)}`).toBe(true);
      } else if (documented!.otherTypes?.length) {
        expect(
          typeMatches(
            res.headers.get("content-type"),
            documented!.otherTypes.map((t) => t.contentType),
          ),
          `${route.operationId} content-type ${res.headers.get("content-type")}`,
        ).toBe(true);
        expect((await res.arrayBuffer()).byteLength, route.operationId).toBeGreaterThan(0);
      } else if (res.status === 204) {
        expect(await res.text()).toBe("");
      } else if (!documented!.schema) {
        await res.arrayBuffer();
      } else {
        throw new Error(`${route.operationId}: ${res.headers.get("content-type")} is not documented`);
      }

      // A recompute runs on in the background: let it finish before the next route reads the series.
      if (route.operationId === "startRecompute") await waitForJobs();
    });
  }
});

async function waitForJobs() {
  const { job } = (await (await callExample(findRoute("startRecompute"))).json()) as { job: { id: string } };
  for (let attempt = 0; attempt < 400; attempt += 1) {
    const current = await getJob({ jobId: job.id });
    if (current && current.status !== "queued" && current.status !== "running") return;
    await new Promise((resolve) => setTimeout(resolve, 50));
  }
  throw new Error("The recompute did not finish");
}
