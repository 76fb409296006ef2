/**
 * The production front server (lib/server/front-server.ts) in front of a
 * stand-in for Next: what it answers itself, and that everything else
 * reaches Next and comes back whole (status, headers, several cookies,
 * request bodies, streamed answers).
 */
import { createServer, type IncomingMessage, type Server } from "node:http";
import type { AddressInfo } from "node:net";

import { afterAll, beforeAll, describe, expect, it } from "vitest";

import { eq } from "drizzle-orm";

import { GET as seriesPage } from "@/app/api/v1/series/[kind]/route";
import { getDb } from "@/db/client";
import { refreshSeriesForDays } from "@/db/queries/series";
import { observations } from "@/db/schema";
import { startFrontServer, type FrontServer } from "@/lib/server/front-server";
import { findFreePort } from "@/lib/server/free-port";

import { insertObservation, makeUser, sessionCookie } from "./support";

let upstream: Server;
let front: FrontServer;
let base: string;
const seen: Array<{ method: string; url: string; headers: IncomingMessage["headers"]; body: string }> = [];

beforeAll(async () => {
  // Next's stand-in: echoes what it got, sets two cookies, and streams /slow in two parts.
  upstream = createServer((req, res) => {
    let body = "";
    req.on("data", (chunk: Buffer) => (body += chunk.toString()));
    req.on("end", () => {
      seen.push({ method: req.method!, url: req.url!, headers: req.headers, body });
      if (req.url === "/slow") {
        res.writeHead(200, { "content-type": "text/plain" });
        res.write("first ");
        setTimeout(() => res.end("second"), 150);
        return;
      }
      res.setHeader("set-cookie", ["a=1; Path=/", "b=2; Path=/; HttpOnly"]);
      res.writeHead(req.url === "/missing" ? 404 : 201, {
        "content-type": "application/json",
        "x-next": "yes",
      });
      res.end(JSON.stringify({ method: req.method, url: req.url, body }));
    });
  });
  await new Promise<void>((resolve) => upstream.listen(0, "127.0.0.1", resolve));
  front = await startFrontServer({
    port: 0,
    host: "127.0.0.1",
    upstream: { host: "127.0.0.1", port: (upstream.address() as AddressInfo).port },
    fastRoutes: [
      {
        pattern: /^\/api\/v1\/series\/(?<kind>(?:daily|monthly|yearly)(?:\.csv)?)$/,
        handler: (request, { params }) =>
          seriesPage(request, { params: params as Promise<{ kind: string }> }),
      },
    ],
  });
  base = `http://127.0.0.1:${front.port}`;
});

afterAll(async () => {
  await front.close();
  await new Promise<void>((resolve) => upstream.close(() => resolve()));
});

describe("front server", () => {
  it("answers the series pages with the route handler itself, role check included", async () => {
    const before = seen.length;
    const observer = await makeUser({ role: "observer" });
    const id = await insertObservation({ owner: observer, day: "2024-03-05", groups: 2, spots: 7 });
    await getDb().update(observations).set({ status: "accepted" }).where(eq(observations.id, id));
    await refreshSeriesForDays({ days: ["2024-03-05"] });
    const cookie = await sessionCookie(observer.user.id);
    const query = "/api/v1/series/daily?from=2024-01-01&sort=mean:desc&page=1&pageSize=10";
    const page = await fetch(`${base}${query}`, { headers: { cookie } });
    expect(page.status).toBe(200);
    expect(page.headers.get("content-type")).toContain("application/json");
    const direct = await seriesPage(new Request(`http://localhost${query}`, { headers: { cookie } }), {
      params: Promise.resolve({ kind: "daily" }),
    });
    const body = await page.text();
    expect(body).toBe(await direct.text());
    expect(JSON.parse(body)).toMatchObject({ total: 1, data: [{ day: "2024-03-05", observers: 1 }] });

    const csv = await fetch(`${base}/api/v1/series/monthly.csv`, { headers: { cookie } });
    expect(csv.status).toBe(200);
    expect(csv.headers.get("content-disposition")).toContain("heliotally-monthly-all.csv");

    const head = await fetch(`${base}/api/v1/series/daily`, { method: "HEAD", headers: { cookie } });
    expect(head.status).toBe(200);
    expect(await head.text()).toBe("");

    // No session: the handler's own guard answers.
    const anonymous = await fetch(`${base}/api/v1/series/daily`);
    expect(anonymous.status).toBe(401);
    const bad = await fetch(`${base}/api/v1/series/daily?pageSize=5000`, { headers: { cookie } });
    expect(bad.status).toBe(400);
    expect(seen.length).toBe(before);
  });

  it("passes everything else to Next: other paths, other methods, other series routes", async () => {
    const before = seen.length;
    const post = await fetch(`${base}/api/v1/series/daily?x=1`, {
      method: "POST",
      body: "a body",
      headers: { "content-type": "text/plain" },
    });
    expect(post.status).toBe(201);
    expect(post.headers.get("x-next")).toBe("yes");
    expect(post.headers.getSetCookie()).toEqual(["a=1; Path=/", "b=2; Path=/; HttpOnly"]);
    expect(await post.json()).toEqual({ method: "POST", url: "/api/v1/series/daily?x=1", body: "a body" });

    for (const path of ["/api/v1/series/chart?from=2020-01-01", "/archive", "/api/v1/series/daily/extra"])
      expect((await fetch(`${base}${path}`)).status).toBe(201);
    expect((await fetch(`${base}/missing`)).status).toBe(404);

    const forwarded = seen.slice(before);
    expect(forwarded.map((r) => r.url)).toEqual([
      "/api/v1/series/daily?x=1",
      "/api/v1/series/chart?from=2020-01-01",
      "/archive",
      "/api/v1/series/daily/extra",
      "/missing",
    ]);
    // Next sees the host the browser asked for, and who asked.
    expect(forwarded[0]!.headers.host).toBe(`127.0.0.1:${front.port}`);
    expect(forwarded[0]!.headers["x-forwarded-host"]).toBe(`127.0.0.1:${front.port}`);
    expect(forwarded[0]!.headers["x-forwarded-for"]).toBe("127.0.0.1");
    expect(forwarded[0]!.headers["x-forwarded-proto"]).toBe("http");
  });

  it("streams Next's answers as they come", async () => {
    const response = await fetch(`${base}/slow`);
    const reader = response.body!.getReader();
    const started = performance.now();
    const first = await reader.read();
    const firstAfter = performance.now() - started;
    let rest = "";
    for (let part = await reader.read(); !part.done; part = await reader.read())
      rest += new TextDecoder().decode(part.value);
    expect(new TextDecoder().decode(first.value)).toBe("first ");
    expect(rest).toBe("second");
    // The first part arrives before Next has finished (it waits 150 ms).
    expect(firstAfter).toBeLessThan(120);
  });

  it("says so plainly when Next is not there", async () => {
    const nobody = await startFrontServer({
      port: 0,
      host: "127.0.0.1",
      upstream: { host: "127.0.0.1", port: await findFreePort() },
      fastRoutes: [],
    });
    try {
      const response = await fetch(`http://127.0.0.1:${nobody.port}/`);
      expect(response.status).toBe(502);
      expect(await response.text()).toMatch(/starting or restarting/);
    } finally {
      await nobody.close();
    }
  });
});
