import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";

import { createClient } from "@libsql/client";
import { parse } from "csv-parse/sync";
import { count } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";

import { GET as snapshotRoute } from "@/app/api/v1/admin/snapshot/route";
import { GET as logbookExport } from "@/app/api/v1/exports/logbook/route";
import { GET as networkExport } from "@/app/api/v1/exports/network/route";
import { POST as importRoute } from "@/app/api/v1/imports/route";
import { getDb } from "@/db/client";
import { insertApiToken } from "@/db/queries/api-tokens";
import { observationGroups, observations } from "@/db/schema";
import { generateApiToken } from "@/lib/auth/api-token";
import { waitForImportFlagJobs } from "@/lib/import/flag-import";
import { suggestMapping } from "@/lib/import/sniff";

import { apiRequest, makeUser } from "./support";

type Made = Awaited<ReturnType<typeof makeUser>>;
let alice: Made;
let bob: Made;
let coordinator: Made;
let admin: Made;
let aliceObservationId: string;

beforeAll(async () => {
  alice = await makeUser({ role: "observer", name: "Alice" });
  bob = await makeUser({ role: "observer", name: "Bob" });
  coordinator = await makeUser({ role: "coordinator" });
  admin = await makeUser({ role: "admin" });
  const db = getDb();
  const [a1] = await db
    .insert(observations)
    .values({
      observerId: alice.observer!.id,
      instrumentId: alice.instrument!.id,
      observedAt: new Date("2024-05-10T08:15:00Z"),
      utDate: "2024-05-10",
      seeing: 2,
      groups: 2,
      spots: 9,
      northGroups: 1,
      northSpots: 4,
      southGroups: 1,
      southSpots: 5,
      notes: '=HYPERLINK("x") and, a "quote"',
      status: "accepted",
      source: "tracer",
    })
    .returning();
  aliceObservationId = a1!.id;
  await db.insert(observations).values({
    observerId: alice.observer!.id,
    instrumentId: alice.instrument!.id,
    observedAt: new Date("2024-05-11T09:00:00Z"),
    utDate: "2024-05-11",
    seeing: 3,
    groups: 0,
    spots: 0,
  });
  await db.insert(observations).values({
    observerId: bob.observer!.id,
    instrumentId: bob.instrument!.id,
    observedAt: new Date("2024-05-10T10:00:00Z"),
    utDate: "2024-05-10",
    seeing: 3,
    groups: 5,
    spots: 40,
  });
  await db.insert(observationGroups).values([
    {
      observationId: aliceObservationId,
      number: 1,
      spots: 4,
      zurichClass: "C",
      mcintoshClass: "Cao",
      latitudeDeg: 12.5,
      cmdDeg: -20.1,
      carringtonLonDeg: 211.3,
      hemisphere: "N",
      areaMsh: 40,
    },
    {
      observationId: aliceObservationId,
      number: 2,
      spots: 5,
      zurichClass: "D",
      mcintoshClass: "Dai",
      latitudeDeg: -8.25,
      cmdDeg: 31,
      carringtonLonDeg: 262.4,
      hemisphere: "S",
      areaMsh: 120,
    },
  ]);
});

afterAll(async () => {
  await waitForImportFlagJobs();
});

const get = async (
  handler: (r: Request) => Promise<Response>,
  url: string,
  userId?: string,
  headers?: Record<string, string>,
) => handler(await apiRequest(url, { userId, headers }));

describe("GET /api/v1/exports/logbook", () => {
  it("gives an observer their complete Logbook as CSV, and nobody else's rows", async () => {
    const res = await get(logbookExport, "/api/v1/exports/logbook", alice.user.id);
    expect(res.status).toBe(200);
    expect(res.headers.get("content-type")).toContain("text/csv");
    expect(res.headers.get("content-disposition")).toMatch(
      /attachment; filename="heliotally-logbook-HT-T\d+-\d{4}-\d{2}-\d{2}\.csv"/,
    );
    const rows: string[][] = parse(await res.text());
    expect(rows[0]).toEqual(expect.arrayContaining(["observed_at_ut", "g", "s", "g_north", "notes"]));
    expect(rows).toHaveLength(3);
    const header = rows[0]!;
    const first = Object.fromEntries(header.map((h, i) => [h, rows[1]![i]]));
    expect(first).toMatchObject({
      observed_at_ut: "2024-05-10T08:15:00.000Z",
      g: "2",
      s: "9",
      g_north: "1",
      s_south: "5",
      relative_number: "29",
    });
    // A note that a spreadsheet would run as a formula is defused; quotes and commas survive.
    expect(first.notes).toBe(`'=HYPERLINK("x") and, a "quote"`);
  });

  it("reads straight back through the import's column recognition", async () => {
    const res = await get(logbookExport, "/api/v1/exports/logbook", alice.user.id);
    const rows: string[][] = parse(await res.text());
    const suggestion = suggestMapping({ rows, instrumentNames: ["Test pinhole"] });
    expect(suggestion.hasHeader).toBe(true);
    expect(suggestion.mapping).toMatchObject({
      date: 1,
      instrument: 3,
      seeing: 4,
      groups: 5,
      spots: 6,
      northGroups: 7,
      northSpots: 8,
      southGroups: 9,
      southSpots: 10,
      notes: 15,
    });
    expect(suggestion.dateFormats[0]).toBe("iso-datetime");
  });

  it("gives JSON with the groups, their classes and positions", async () => {
    const res = await get(logbookExport, "/api/v1/exports/logbook?format=json", alice.user.id);
    expect(res.headers.get("content-type")).toContain("application/json");
    const body = await res.json();
    expect(body).toMatchObject({
      format: "heliotally.logbook",
      version: 1,
      observer: { code: alice.observer!.code },
    });
    expect(body.instruments).toHaveLength(1);
    expect(body.observations).toHaveLength(2);
    const traced = body.observations.find((o: { id: string }) => o.id === aliceObservationId);
    expect(traced.sunspotGroups).toEqual([
      expect.objectContaining({
        number: 1,
        mcintoshClass: "Cao",
        latitudeDeg: 12.5,
        cmdDeg: -20.1,
        carringtonLonDeg: 211.3,
        hemisphere: "N",
      }),
      expect.objectContaining({
        number: 2,
        zurichClass: "D",
        latitudeDeg: -8.25,
        hemisphere: "S",
        areaMsh: 120,
      }),
    ]);
  });

  it("lets a coordinator export any observer, and answers 404 to an observer asking for someone else", async () => {
    const asCoordinator = await get(
      logbookExport,
      `/api/v1/exports/logbook?observerId=${bob.observer!.id}`,
      coordinator.user.id,
    );
    expect(asCoordinator.status).toBe(200);
    expect(parse(await asCoordinator.text())).toHaveLength(2);
    const asAlice = await get(
      logbookExport,
      `/api/v1/exports/logbook?observerId=${bob.observer!.id}`,
      alice.user.id,
    );
    expect(asAlice.status).toBe(404);
    expect((await get(logbookExport, "/api/v1/exports/logbook?format=xml", alice.user.id)).status).toBe(400);
    expect((await get(logbookExport, "/api/v1/exports/logbook")).status).toBe(401);
  });

  it("works with a read-only API token", async () => {
    const { token, prefix, tokenHash } = generateApiToken();
    await insertApiToken({ userId: alice.user.id, name: "export", scope: "read", prefix, tokenHash });
    const res = await get(logbookExport, "/api/v1/exports/logbook", undefined, {
      authorization: `Bearer ${token}`,
    });
    expect(res.status).toBe(200);
  });

  it("streams a large Logbook page by page", async () => {
    const carol = await makeUser({ role: "observer", name: "Carol" });
    const lines = ["date,g,s"];
    for (let d = 0; d < 4500; d++)
      lines.push(`${new Date(Date.UTC(1990, 0, 1) + d * 86_400_000).toISOString().slice(0, 10)},1,2`);
    const imported = await importRoute(
      await apiRequest(
        `/api/v1/imports?date=1&groups=2&spots=3&dateFormat=yyyy-mm-dd&defaultSeeing=3&instrumentId=${carol.instrument!.id}`,
        {
          method: "POST",
          userId: carol.user.id,
          body: lines.join("\n"),
          headers: { "content-type": "text/csv" },
        },
      ),
    );
    expect(imported.status).toBe(201);
    const res = await get(logbookExport, "/api/v1/exports/logbook", carol.user.id);
    const rows: string[][] = parse(await res.text());
    expect(rows).toHaveLength(4501);
    // In observation order across page boundaries.
    expect(rows[2001]![1]).toBe(
      new Date(Date.UTC(1990, 0, 1) + 2000 * 86_400_000).toISOString().slice(0, 10),
    );
    const json = await (
      await get(logbookExport, "/api/v1/exports/logbook?format=json", carol.user.id)
    ).json();
    expect(json.observations).toHaveLength(4500);
  });
});

describe("GET /api/v1/exports/network", () => {
  it("gives coordinators the whole archive with observer codes", async () => {
    const res = await get(networkExport, "/api/v1/exports/network", coordinator.user.id);
    expect(res.status).toBe(200);
    const rows: string[][] = parse(await res.text());
    const [totalRow] = await getDb().select({ n: count() }).from(observations);
    expect(rows).toHaveLength(totalRow!.n + 1);
    expect(rows[0]!.slice(0, 2)).toEqual(["observer_code", "observer_name"]);
    expect(rows.some((r) => r[0] === bob.observer!.code)).toBe(true);
    const json = await (
      await get(networkExport, "/api/v1/exports/network?format=json", coordinator.user.id)
    ).json();
    expect(json.format).toBe("heliotally.network-archive");
    expect(json.observers.length).toBeGreaterThanOrEqual(2);
    expect(json.observations).toHaveLength(totalRow!.n);
  });

  it("is refused to observers (403)", async () => {
    expect((await get(networkExport, "/api/v1/exports/network", alice.user.id)).status).toBe(403);
  });
});

describe("GET /api/v1/admin/snapshot", () => {
  it("gives an admin a consistent SQLite copy of the whole database", async () => {
    const res = await get(snapshotRoute, "/api/v1/admin/snapshot", admin.user.id);
    expect(res.status).toBe(200);
    expect(res.headers.get("content-disposition")).toMatch(/heliotally-snapshot-\d{8}-\d{6}Z\.sqlite/);
    const bytes = new Uint8Array(await res.arrayBuffer());
    expect(Number(res.headers.get("content-length"))).toBe(bytes.length);
    // Every SQLite database file starts with this 16-byte header (sqlite.org file format, section 1.3).
    expect(new TextDecoder().decode(bytes.subarray(0, 16))).toBe("SQLite format 3\u0000");
    const folder = mkdtempSync(path.join(tmpdir(), "snapshot-check-"));
    try {
      const file = path.join(folder, "copy.sqlite");
      writeFileSync(file, bytes);
      const copy = createClient({ url: `file:${file}` });
      const counted = await copy.execute("SELECT count(*) AS n FROM observations");
      const [live] = await getDb().select({ n: count() }).from(observations);
      expect(Number(counted.rows[0]!.n)).toBe(live!.n);
      copy.close();
    } finally {
      rmSync(folder, { recursive: true, force: true });
    }
  });

  it("is refused to coordinators and to API tokens, even an admin's", async () => {
    expect((await get(snapshotRoute, "/api/v1/admin/snapshot", coordinator.user.id)).status).toBe(403);
    const { token, prefix, tokenHash } = generateApiToken();
    await insertApiToken({ userId: admin.user.id, name: "backup", scope: "read", prefix, tokenHash });
    const res = await get(snapshotRoute, "/api/v1/admin/snapshot", undefined, {
      authorization: `Bearer ${token}`,
    });
    expect(res.status).toBe(403);
    expect((await res.json()).error.message).toContain("not with an API token");
  });
});
