import { beforeAll, describe, expect, it } from "vitest";
import type { z } from "zod";

import { GET as openapiRoute } from "@/app/api/v1/openapi.json/route";
import { POST as importRoute } from "@/app/api/v1/imports/route";
import { GET as kRoute } from "@/app/api/v1/observers/[id]/k/route";
import { GET as listRoute, POST as createRoute } from "@/app/api/v1/observations/route";
import { GET as seriesRoute } from "@/app/api/v1/series/[kind]/route";
import { GET as solarRoute } from "@/app/api/v1/solar-orientation/route";
import { getDb } from "@/db/client";
import { insertApiToken } from "@/db/queries/api-tokens";
import { kCoefficients, seriesDaily, seriesMonthly } from "@/db/schema";
import { formatCurlExample } from "@/lib/api/openapi";
import { API_ROUTES } from "@/lib/api/routes";
import {
  dailySeriesPageSchema,
  errorBodySchema,
  importResultSchema,
  kHistorySchema,
  monthlySeriesPageSchema,
  observationPageSchema,
  observationViewSchema,
  solarOrientationSchema,
} from "@/lib/api/schemas";
import { generateApiToken } from "@/lib/auth/api-token";
import { importOptionsSchema } from "@/lib/validation/import";
import { observationInputSchema } from "@/lib/validation/observation";
import { observationListQuerySchema } from "@/lib/validation/observation-query";

import { listApiRouteFiles, servesPath, toOpenApiPath } from "./api-route-files";
import { apiRequest, makeUser } from "./support";

type Doc = {
  openapi: string;
  paths: Record<
    string,
    Record<
      string,
      {
        parameters?: Array<{ name: string; in: string }>;
        requestBody?: { content: Record<string, { schema: { properties?: Record<string, unknown> } }> };
        responses: Record<string, unknown>;
        security: unknown[];
      }
    >
  >;
  components: { schemas: Record<string, unknown>; securitySchemes: Record<string, unknown> };
};

let doc: Doc;
let observer: Awaited<ReturnType<typeof makeUser>>;
let token: string;

beforeAll(async () => {
  const res = await openapiRoute(await apiRequest("/api/v1/openapi.json"));
  expect(res.status).toBe(200);
  doc = await res.json();
  observer = await makeUser({ role: "observer" });
  const minted = generateApiToken();
  await insertApiToken({
    userId: observer.user.id,
    name: "docs",
    scope: "read-submit",
    prefix: minted.prefix,
    tokenHash: minted.tokenHash,
  });
  token = minted.token;
});

const auth = () => ({ authorization: `Bearer ${token}` });

function expectShape(schema: z.ZodType, body: unknown) {
  const result = schema.safeParse(body);
  if (!result.success)
    throw new Error(
      `The answer does not match the documented schema:\n${JSON.stringify(result.error.issues, null, 1)}`,
    );
}

/** Every key of an object schema's shape (the zod 4 object exposes `.shape`). */
const keysOf = (schema: z.ZodType) =>
  Object.keys((schema as unknown as { shape: Record<string, unknown> }).shape).sort();

describe("GET /api/v1/openapi.json", () => {
  it("is an OpenAPI 3.1 document with the routes the public API promises", () => {
    expect(doc.openapi).toBe("3.1.0");
    const operations = Object.entries(doc.paths).flatMap(([p, methods]) =>
      Object.keys(methods).map((m) => `${m.toUpperCase()} ${p}`),
    );
    expect(operations).toEqual(
      expect.arrayContaining([
        "GET /api/v1/observations",
        "POST /api/v1/observations",
        "GET /api/v1/series/daily",
        "GET /api/v1/series/monthly",
        "GET /api/v1/series/yearly",
        "GET /api/v1/observers/{id}/k",
        "GET /api/v1/solar-orientation",
        "POST /api/v1/imports",
        "GET /api/v1/exports/logbook",
      ]),
    );
    expect(doc.components.securitySchemes).toHaveProperty("bearerToken");
  });

  it("documents every method of every route handler under app/api/v1", () => {
    const files = listApiRouteFiles();
    expect(files.length).toBeGreaterThan(20);
    const missing = files.flatMap((file) =>
      file.methods
        .filter(
          (method) =>
            !Object.entries(doc.paths).some(
              ([documented, operations]) =>
                servesPath(file, documented) && method.toLowerCase() in operations,
            ),
        )
        .map((method) => `${method} ${toOpenApiPath(file.segments)} (${file.file})`),
    );
    expect(missing, "Add these to lib/api/routes.ts").toEqual([]);
  });

  it("documents only routes and methods that exist in app/api/v1", () => {
    const files = listApiRouteFiles();
    for (const route of API_ROUTES) {
      const served = files.filter((file) => servesPath(file, route.path));
      expect(served, `${route.method} ${route.path}`).not.toEqual([]);
      expect(
        served.some((file) => file.methods.includes(route.method.toUpperCase() as never)),
        `${route.method.toUpperCase()} ${route.path} is documented but not exported`,
      ).toBe(true);
    }
  });

  it("says every write accepts Idempotency-Key, and documents it as a header", () => {
    for (const route of API_ROUTES.filter((r) => r.method !== "get")) {
      expect(route.idempotent, `${route.method} ${route.path}`).toBe(true);
      const header = doc.paths[route.path]![route.method]!.parameters?.find((p) => p.in === "header");
      expect(header?.name, `${route.method} ${route.path}`).toBe("Idempotency-Key");
      expect(doc.paths[route.path]![route.method]!.responses, route.path).toHaveProperty("409");
    }
  });

  it("gives every example in the terms of the schemas it illustrates", () => {
    for (const route of API_ROUTES) {
      const label = `${route.operationId} example`;
      const check = (schema: z.ZodType | undefined, value: unknown, part: string) => {
        if (schema === undefined || value === undefined) return;
        const result = schema.safeParse(value);
        expect(result.success, `${label} ${part}: ${JSON.stringify(result.error?.issues)}`).toBe(true);
      };
      check(route.pathParams, route.example.pathParams, "path");
      check(route.query, route.example.query ?? {}, "query");
      check(route.body?.schema, route.example.body, "body");
      if (route.body) {
        expect(
          route.example.body !== undefined || route.example.bodyText !== undefined,
          `${label} needs a body`,
        ).toBe(true);
      }
      for (const name of route.pathParams ? keysOf(route.pathParams) : [])
        expect(route.example.pathParams, `${label} path ${name}`).toHaveProperty(name);
    }
  });

  it("takes parameters and bodies from the very schemas the routes parse with", () => {
    const names = (p: string, m: string, where = "query") =>
      (doc.paths[p]![m]!.parameters ?? [])
        .filter((x) => x.in === where)
        .map((x) => x.name)
        .sort();
    expect(names("/api/v1/observations", "get")).toEqual(keysOf(observationListQuerySchema));
    expect(names("/api/v1/imports", "post")).toEqual(keysOf(importOptionsSchema));
    expect(names("/api/v1/imports", "post", "header")).toEqual(["Idempotency-Key"]);
    const body = doc.paths["/api/v1/observations"]!.post!.requestBody!.content["application/json"]!.schema;
    expect(Object.keys(body.properties ?? {}).sort()).toEqual(keysOf(observationInputSchema));
  });

  it("resolves every $ref", () => {
    const refs = JSON.stringify(doc).match(/"\$ref":"([^"]+)"/g) ?? [];
    expect(refs.length).toBeGreaterThan(5);
    for (const ref of refs) {
      const target = ref.slice(8, -1).replace("#/components/schemas/", "");
      expect(doc.components.schemas, ref).toHaveProperty(target);
    }
  });

  it("writes curl examples that send the token", () => {
    const submit = API_ROUTES.find((r) => r.operationId === "submitObservation")!;
    const curl = formatCurlExample({ route: submit, origin: "http://localhost:3000" });
    expect(curl).toContain('curl -X POST "http://localhost:3000/api/v1/observations"');
    expect(curl).toContain('-H "Authorization: Bearer $HELIOTALLY_TOKEN"');
    expect(curl).toContain("Idempotency-Key");
    const imports = formatCurlExample({
      route: API_ROUTES.find((r) => r.operationId === "importLogbook")!,
      origin: "http://x",
    });
    expect(imports).toContain("--data-binary @logbook.csv");
  });
});

describe("real answers match the documented schemas", () => {
  it("observations: submit, list, and an error", async () => {
    const created = await createRoute(
      await apiRequest("/api/v1/observations", {
        method: "POST",
        headers: auth(),
        body: {
          observedAt: "2025-06-01T08:00:00Z",
          seeing: 2,
          instrumentId: observer.instrument!.id,
          groups: 2,
          spots: 7,
        },
      }),
    );
    expect(created.status).toBe(201);
    expectShape(observationViewSchema, await created.json());
    const listed = await listRoute(await apiRequest("/api/v1/observations", { headers: auth() }));
    expectShape(observationPageSchema, await listed.json());
    const bad = await createRoute(
      await apiRequest("/api/v1/observations", { method: "POST", headers: auth(), body: { groups: -1 } }),
    );
    expect(bad.status).toBe(400);
    expectShape(errorBodySchema, await bad.json());
  });

  it("imports", async () => {
    const res = await importRoute(
      await apiRequest(
        `/api/v1/imports?date=1&groups=2&spots=3&dateFormat=yyyy-mm-dd&defaultSeeing=3&instrumentId=${observer.instrument!.id}`,
        {
          method: "POST",
          headers: { ...auth(), "content-type": "text/csv" },
          body: "date,g,s\n2001-01-01,1,3\n",
        },
      ),
    );
    expect(res.status).toBe(201);
    expectShape(importResultSchema, await res.json());
  });

  it("series, k history and the solar orientation", async () => {
    const db = getDb();
    await db.insert(seriesDaily).values({
      day: "2025-06-01",
      hemisphere: "all",
      observers: 3,
      sum: 150,
      sumSquares: 7600,
      mean: 50,
      sd: 5,
    });
    await db.insert(seriesMonthly).values({
      month: "2025-06",
      hemisphere: "all",
      days: 1,
      sumOfDailyMeans: 50,
      mean: 50,
      smoothed: null,
    });
    await db.insert(kCoefficients).values({
      observerId: observer.observer!.id,
      periodStart: "2024-01-01",
      periodEnd: "2024-12-31",
      k: 0.87,
      sigma: 0.03,
      commonDays: 120,
      method: "ratio-of-sums",
      reference: "network",
    });
    const daily = await seriesRoute(
      await apiRequest("/api/v1/series/daily?from=2025-01-01&to=2025-12-31", { headers: auth() }),
      {
        params: Promise.resolve({ kind: "daily" }),
      },
    );
    expect(daily.status).toBe(200);
    expectShape(dailySeriesPageSchema, await daily.json());
    const monthly = await seriesRoute(await apiRequest("/api/v1/series/monthly", { headers: auth() }), {
      params: Promise.resolve({ kind: "monthly" }),
    });
    expectShape(monthlySeriesPageSchema, await monthly.json());
    const k = await kRoute(await apiRequest("/api/v1/observers/me/k", { headers: auth() }), {
      params: Promise.resolve({ id: "me" }),
    });
    expect(k.status).toBe(200);
    const kBody = await k.json();
    expectShape(kHistorySchema, kBody);
    expect(kBody.data[0]).toMatchObject({ k: 0.87, commonDays: 120 });
    const sun = await solarRoute(
      await apiRequest("/api/v1/solar-orientation?at=2026-03-14T09:30:00Z", { headers: auth() }),
    );
    expectShape(solarOrientationSchema, await sun.json());
  });

  it("k history: coordinators may read anyone's, observers only their own (404 otherwise)", async () => {
    const other = await makeUser({ role: "observer" });
    const coordinator = await makeUser({ role: "coordinator" });
    const params = { params: Promise.resolve({ id: other.observer!.id }) };
    expect(
      (
        await kRoute(
          await apiRequest(`/api/v1/observers/${other.observer!.id}/k`, { userId: coordinator.user.id }),
          params,
        )
      ).status,
    ).toBe(200);
    expect(
      (
        await kRoute(
          await apiRequest(`/api/v1/observers/${other.observer!.id}/k`, { headers: auth() }),
          params,
        )
      ).status,
    ).toBe(404);
    const own = { params: Promise.resolve({ id: observer.observer!.id }) };
    expect(
      (
        await kRoute(
          await apiRequest(`/api/v1/observers/${observer.observer!.id}/k`, { headers: auth() }),
          own,
        )
      ).status,
    ).toBe(200);
  });
});
