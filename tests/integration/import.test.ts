import { and, count, eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";

import { POST as importRoute } from "@/app/api/v1/imports/route";
import { GET as listObservations } from "@/app/api/v1/observations/route";
import { getDb } from "@/db/client";
import { importBatches, instruments, observationFlags, observations } from "@/db/schema";
import { waitForImportFlagJobs } from "@/lib/import/flag-import";
import { MAX_REPORTED_PROBLEMS } from "@/lib/validation/import";

import { apiRequest, makeUser, sessionCookie } from "./support";

type Made = Awaited<ReturnType<typeof makeUser>>;
let alice: Made;
let bob: Made;
let coordinator: Made;
let student: Made;
let mirrorId: string;

const BASE_QUERY = {
  date: "1",
  groups: "2",
  spots: "3",
  dateFormat: "yyyy-mm-dd",
  timeZone: "UTC",
  defaultSeeing: "3",
};

function query(extra: Record<string, string> = {}, withInstrument: string | null = null) {
  const q = new URLSearchParams({
    ...BASE_QUERY,
    ...(withInstrument ? { instrumentId: withInstrument } : {}),
    ...extra,
  });
  return q.toString();
}

async function postCsv(
  csv: string | Uint8Array,
  { userId, q, headers = {} }: { userId: string; q: string; headers?: Record<string, string> },
) {
  const h = new Headers({ "content-type": "text/csv", ...headers });
  h.set("cookie", await sessionCookie(userId));
  return importRoute(
    new Request(new URL(`/api/v1/imports?${q}`, "http://localhost:3999"), {
      method: "POST",
      headers: h,
      body: typeof csv === "string" ? csv : Buffer.from(csv),
    }),
  );
}

async function countRows(observerId: string) {
  const [row] = await getDb()
    .select({ n: count() })
    .from(observations)
    .where(eq(observations.observerId, observerId));
  return row?.n ?? 0;
}

async function countBatches() {
  const [row] = await getDb().select({ n: count() }).from(importBatches);
  return row?.n ?? 0;
}

const GOOD = [
  "date,g,s,notes",
  "2019-03-01,2,9,thin cloud",
  "2019-03-02,3,14,",
  "2019-03-04,0,0,spotless",
].join("\n");

beforeAll(async () => {
  alice = await makeUser({ role: "observer", name: "Alice" });
  bob = await makeUser({ role: "observer", name: "Bob" });
  coordinator = await makeUser({ role: "coordinator" });
  student = await makeUser({ role: "student" });
  const [mirror] = await getDb()
    .insert(instruments)
    .values({ observerId: alice.observer!.id, name: "Mirror 6 mm", kind: "mirror" })
    .returning();
  mirrorId = mirror!.id;
});

afterAll(async () => {
  await waitForImportFlagJobs();
});

describe("POST /api/v1/imports", () => {
  it("imports every row of a good file, marked as imported and awaiting review", async () => {
    const res = await postCsv(GOOD, {
      userId: alice.user.id,
      q: query({ notes: "4", fileName: "old.csv" }, alice.instrument!.id),
    });
    expect(res.status).toBe(201);
    const body = await res.json();
    expect(body).toMatchObject({
      rowsRead: 3,
      imported: 3,
      skipped: 0,
      firstDay: "2019-03-01",
      lastDay: "2019-03-04",
    });
    const rows = await getDb()
      .select()
      .from(observations)
      .where(eq(observations.observerId, alice.observer!.id));
    expect(rows).toHaveLength(3);
    expect(
      rows.every(
        (r) =>
          r.source === "import" &&
          r.status === "submitted" &&
          r.importKey &&
          r.importBatchId === body.batchId,
      ),
    ).toBe(true);
    const spotless = rows.find((r) => r.utDate === "2019-03-04");
    expect(spotless).toMatchObject({ groups: 0, spots: 0, notes: "spotless", seeing: 3 });
    // Date only + default time 12:00 in UTC.
    expect(spotless!.observedAt.toISOString()).toBe("2019-03-04T12:00:00.000Z");

    // …and they show in the Logbook list like any other count.
    const list = await listObservations(
      await apiRequest("/api/v1/observations?sort=observedAt:asc", { userId: alice.user.id }),
    );
    const listed = await list.json();
    expect(listed.data.map((r: { utDate: string }) => r.utDate)).toEqual([
      "2019-03-01",
      "2019-03-02",
      "2019-03-04",
    ]);
  });

  it("adds nothing twice when the same file is imported again", async () => {
    const before = await countRows(alice.observer!.id);
    const res = await postCsv(GOOD, {
      userId: alice.user.id,
      q: query({ notes: "4" }, alice.instrument!.id),
    });
    expect(res.status).toBe(201);
    expect(await res.json()).toMatchObject({ imported: 0, skipped: 3 });
    expect(await countRows(alice.observer!.id)).toBe(before);
  });

  it("reads date-times in the chosen time zone, instrument names, seeing and hemisphere columns", async () => {
    const csv = [
      "Datum;Zeit;Instrument;Q;g;s;gN;sN;gS;sS",
      "17.03.2021;09:30;mirror 6 MM;2;3;17;2;11;1;6",
      "18.03.2021;23:30;Mirror 6 mm;4;1;1;1;1;0;0",
    ].join("\r\n");
    const q = new URLSearchParams({
      delimiter: "semicolon",
      date: "1",
      time: "2",
      instrument: "3",
      seeing: "4",
      groups: "5",
      spots: "6",
      northGroups: "7",
      northSpots: "8",
      southGroups: "9",
      southSpots: "10",
      dateFormat: "dd.mm.yyyy",
      timeZone: "Europe/Berlin",
    });
    const res = await postCsv(csv, { userId: alice.user.id, q: q.toString() });
    expect(res.status).toBe(201);
    const rows = await getDb()
      .select()
      .from(observations)
      .where(and(eq(observations.observerId, alice.observer!.id), eq(observations.instrumentId, mirrorId)));
    const first = rows.find((r) => r.seeing === 2)!;
    // Berlin is UT+1 in March 2021 (summer time starts 28 March): 09:30 local = 08:30 UT.
    expect(first.observedAt.toISOString()).toBe("2021-03-17T08:30:00.000Z");
    expect(first).toMatchObject({ northGroups: 2, northSpots: 11, southGroups: 1, southSpots: 6 });
    // 23:30 local on the 18th is 22:30 UT the same day.
    expect(rows.find((r) => r.seeing === 4)!.utDate).toBe("2021-03-18");
  });

  it("stores nothing and lists every bad line with its number and reason", async () => {
    const before = await countRows(bob.observer!.id);
    const batches = await countBatches();
    const future = new Date(Date.now() + 3 * 86_400_000).toISOString().slice(0, 10);
    const csv = [
      "date,g,s,instrument",
      "2020-01-01,2,8,Test pinhole", // line 2: good
      "2020-02-30,1,3,Test pinhole", // 3: bad date
      `${future},1,3,Test pinhole`, // 4: future date
      "2020-01-03,1.5,3,Test pinhole", // 5: non-integer
      "2020-01-04,-1,3,Test pinhole", // 6: negative
      "2020-01-05,4,2,Test pinhole", // 7: s < g
      "2020-01-06,0,5,Test pinhole", // 8: g = 0 with s > 0
      "2020-01-01,3,9,Test pinhole", // 9: duplicate of line 2
      "2020-01-08,1,2,Big dob", // 10: unknown instrument
      "2020-01-09,x,2,Test pinhole", // 11: not a number
    ].join("\n");
    const res = await postCsv(csv, { userId: bob.user.id, q: query({ instrument: "4" }) });
    expect(res.status).toBe(400);
    const body = await res.json();
    expect(body.error.code).toBe("invalid_input");
    expect(body.error.message).toContain("nothing was imported");
    const byLine = (n: number) =>
      body.error.issues.filter((i: { path: string }) => i.path.startsWith(`line ${n}`));
    expect(byLine(2)).toHaveLength(0);
    expect(byLine(3)[0].message).toMatch(/Line 3 .*not a date/);
    expect(byLine(4)[0].message).toContain("in the future");
    expect(byLine(5)[0].message).toContain("whole number");
    expect(byLine(6)[0].message).toContain("cannot be negative");
    expect(byLine(7)[0].message).toContain("Fewer spots than groups");
    expect(byLine(8)[0].message).toContain("no groups");
    expect(byLine(9)[0].message).toContain("Duplicate day and instrument: line 2");
    expect(byLine(10)[0].message).toContain("Unknown instrument “Big dob”");
    expect(byLine(11)[0].message).toContain("must be a number");
    expect(await countRows(bob.observer!.id)).toBe(before);
    expect(await countBatches()).toBe(batches);
  });

  it("refuses a day and instrument that the Logbook already holds", async () => {
    const csv = "date,g,s\n2019-03-02,5,30\n";
    const res = await postCsv(csv, { userId: alice.user.id, q: query({}, alice.instrument!.id) });
    expect(res.status).toBe(400);
    const body = await res.json();
    expect(body.error.issues[0]).toMatchObject({ path: "line 2.date" });
    expect(body.error.issues[0].message).toContain("your Logbook already has a count for 2019-03-02");
  });

  it("caps the report but counts every problem", async () => {
    const lines = ["date,g,s"];
    for (let i = 0; i < MAX_REPORTED_PROBLEMS + 50; i++) lines.push(`not-a-date-${i},1,1`);
    const res = await postCsv(lines.join("\n"), { userId: bob.user.id, q: query({}, bob.instrument!.id) });
    const body = await res.json();
    expect(res.status).toBe(400);
    expect(body.error.issues).toHaveLength(MAX_REPORTED_PROBLEMS);
    expect(body.error.message).toContain("1,050 problems");
  });

  describe("refuses malformed files with a clear message and stores nothing", () => {
    const cases: Array<[string, string | Uint8Array, Record<string, string>, number, RegExp]> = [
      ["an empty file", "", {}, 400, /file is empty/],
      ["only blank lines", "\n\n  \n", {}, 400, /only blank lines/],
      ["a header without rows", "date,g,s\n", {}, 400, /header line but no rows/],
      [
        "the wrong delimiter",
        "date;g;s\n2020-01-01;1;2\n",
        {},
        400,
        /separate values with semicolons, not commas/,
      ],
      [
        "unbalanced quotes",
        'date,g,s,notes\n2020-01-01,1,2,"cloud\n2020-01-02,1,2,x\n',
        { notes: "4" },
        400,
        /never closed/,
      ],
      [
        "a stray quote",
        'date,g,s,notes\n2020-01-01,1,2,5" gap\n',
        { notes: "4" },
        400,
        /Line 2: a double quote is in the wrong place/,
      ],
      ["binary data", new Uint8Array([0x64, 0x61, 0x74, 0x65, 0, 1, 2, 3, 255, 254]), {}, 400, /binary data/],
      [
        "a spreadsheet workbook",
        new Uint8Array([0x50, 0x4b, 0x03, 0x04, 20, 0, 6, 0]),
        {},
        400,
        /spreadsheet workbook/,
      ],
      [
        "text that is not UTF-8",
        new Uint8Array([...Buffer.from("date,g,s,notes\n2020-01-01,1,2,"), 0xe9, 0x74, 0xe9, 0x0a]),
        { notes: "4" },
        400,
        /not UTF-8/,
      ],
      ["a column past the end", "date,g\n2020-01-01,1\n", {}, 400, /has 2 columns, but column 3 was chosen/],
    ];
    it.each(cases)("%s", async (_name, csv, extra, status, message) => {
      const before = await countRows(bob.observer!.id);
      const res = await postCsv(csv, { userId: bob.user.id, q: query(extra, bob.instrument!.id) });
      expect(res.status).toBe(status);
      const body = await res.json();
      expect(body.error.message).toMatch(message);
      expect(await countRows(bob.observer!.id)).toBe(before);
    });

    it("a 200 MB file, by its declared size, before reading it", async () => {
      let pulled = 0;
      const body = new ReadableStream<Uint8Array>({
        pull(controller) {
          pulled++;
          controller.enqueue(new Uint8Array(1024 * 1024));
          if (pulled > 300) controller.close();
        },
      });
      const req = new Request(
        new URL(`/api/v1/imports?${query({}, bob.instrument!.id)}`, "http://localhost:3999"),
        {
          method: "POST",
          headers: {
            "content-type": "text/csv",
            "content-length": String(200 * 1024 * 1024),
            cookie: await sessionCookie(bob.user.id),
          },
          body,
          duplex: "half",
        } as RequestInit,
      );
      const res = await importRoute(req);
      expect(res.status).toBe(413);
      expect((await res.json()).error.message).toMatch(/200\.0 MB.*32\.0 MB.*Split the logbook/);
      expect(pulled).toBeLessThan(3);
    });

    it("a body that is larger than it claims, by counting", async () => {
      const big = new Uint8Array(33 * 1024 * 1024).fill(0x31);
      const res = await postCsv(big, { userId: bob.user.id, q: query({}, bob.instrument!.id) });
      expect(res.status).toBe(413);
    });
  });

  it("checks the options with the shared schema", async () => {
    const res = await postCsv(GOOD, {
      userId: alice.user.id,
      q: new URLSearchParams({ date: "1", groups: "1", dateFormat: "dd/mm/yy" }).toString(),
    });
    expect(res.status).toBe(400);
    const body = await res.json();
    expect(body.error.issues.map((i: { path: string }) => i.path)).toEqual(["dateFormat"]);
    // Once each option reads, the rules between them are checked together.
    const again = await postCsv(GOOD, {
      userId: alice.user.id,
      q: new URLSearchParams({ date: "1", groups: "1", dateFormat: "yyyy-mm-dd" }).toString(),
    });
    const paths = (await again.json()).error.issues.map((i: { path: string }) => i.path);
    expect(paths).toEqual(expect.arrayContaining(["spots", "groups", "defaultSeeing", "instrumentId"]));
  });

  it("wants a CSV body", async () => {
    const res = await postCsv(GOOD, {
      userId: alice.user.id,
      q: query({}, alice.instrument!.id),
      headers: { "content-type": "application/json" },
    });
    expect(res.status).toBe(415);
  });

  it("lets a coordinator import for an observer, and nobody else", async () => {
    const csv = "date,g,s\n2018-05-01,1,4\n";
    const asCoordinator = await postCsv(csv, {
      userId: coordinator.user.id,
      q: query({ observerId: bob.observer!.id }, bob.instrument!.id),
    });
    expect(asCoordinator.status).toBe(201);
    const [batch] = await getDb()
      .select()
      .from(importBatches)
      .where(eq(importBatches.observerId, bob.observer!.id));
    expect(batch!.byUserId).toBe(coordinator.user.id);

    // Another observer's id answers 404, as if it did not exist.
    const asAlice = await postCsv(csv, {
      userId: alice.user.id,
      q: query({ observerId: bob.observer!.id }, bob.instrument!.id),
    });
    expect(asAlice.status).toBe(404);
    // A coordinator without observerId is told to give one.
    const noTarget = await postCsv(csv, { userId: coordinator.user.id, q: query({}, bob.instrument!.id) });
    expect(noTarget.status).toBe(400);
    // Students keep their counts through their classroom, not imports.
    const asStudent = await postCsv(csv, { userId: student.user.id, q: query({}, student.instrument!.id) });
    expect(asStudent.status).toBe(403);
  });

  it("streams progress lines ending with the result when asked for NDJSON", async () => {
    const lines = ["date,g,s"];
    for (let d = 0; d < 12_000; d++)
      lines.push(
        `${new Date(Date.UTC(1980, 0, 1) + d * 86_400_000).toISOString().slice(0, 10)},1,${1 + (d % 9)}`,
      );
    const res = await postCsv(lines.join("\n"), {
      userId: bob.user.id,
      q: query({}, bob.instrument!.id),
      headers: { accept: "application/x-ndjson" },
    });
    expect(res.headers.get("content-type")).toContain("application/x-ndjson");
    const events = (await res.text())
      .trim()
      .split("\n")
      .map((l) => JSON.parse(l));
    expect(events.filter((e) => e.type === "progress").length).toBeGreaterThanOrEqual(2);
    expect(events.at(-1)).toMatchObject({
      type: "done",
      status: 201,
      result: { imported: 12_000, flags: { status: "running" } },
    });
  });

  it("flags imported counts for the Review desk on arrival, like any other", async () => {
    // Three other observers saw about R = 50 on that day; an imported R = 500 stands out.
    for (let i = 0; i < 3; i++) {
      const other = await makeUser({ role: "observer" });
      await getDb()
        .insert(observations)
        .values({
          observerId: other.observer!.id,
          instrumentId: other.instrument!.id,
          observedAt: new Date("2016-06-01T10:00:00Z"),
          utDate: "2016-06-01",
          seeing: 2,
          groups: 4,
          spots: 8 + i,
          status: "accepted",
        });
    }
    const res = await postCsv("date,g,s\n2016-06-01,20,300\n", {
      userId: bob.user.id,
      q: query({}, bob.instrument!.id),
    });
    expect(res.status).toBe(201);
    expect((await res.json()).flags).toEqual({ status: "done" });
    const [row] = await getDb()
      .select({ id: observations.id })
      .from(observations)
      .where(and(eq(observations.observerId, bob.observer!.id), eq(observations.utDate, "2016-06-01")));
    const flags = await getDb()
      .select()
      .from(observationFlags)
      .where(eq(observationFlags.observationId, row!.id));
    expect(flags.map((f) => f.reason)).toContain("far-from-network");
  });

  it("names the line a bad row starts on, after blank lines and notes over several lines", async () => {
    const csv =
      'date,g,s,notes\n\n2014-02-01,1,2,"over\ntwo lines"\n2014-02-31,1,2,"and\nthree\nlines"\n\n2014-02-03,2,1,\n';
    const res = await postCsv(csv, { userId: bob.user.id, q: query({ notes: "4" }, bob.instrument!.id) });
    expect(res.status).toBe(400);
    const paths = (await res.json()).error.issues.map((i: { path: string }) => i.path);
    expect(paths).toEqual(["line 5.date", "line 9.spots"]);
  });

  it("gives imported counts time-ordered ids (version-7 UUIDs) that sort in file order", async () => {
    // Not in date order, with a note over two lines: file order is line order.
    const csv =
      'date,g,s,notes\n2015-05-03,1,2,"first line,\nand a second"\n2015-05-01,2,5,\n2015-05-02,0,0,\n';
    const before = Date.now();
    const res = await postCsv(csv, { userId: bob.user.id, q: query({ notes: "4" }, bob.instrument!.id) });
    expect(res.status).toBe(201);
    const { batchId } = await res.json();
    const rows = await getDb()
      .select({ id: observations.id, utDate: observations.utDate })
      .from(observations)
      .where(eq(observations.importBatchId, batchId));
    const sorted = [...rows].sort((a, b) => (a.id < b.id ? -1 : 1));
    expect(sorted.map((r) => r.utDate)).toEqual(["2015-05-03", "2015-05-01", "2015-05-02"]);
    for (const { id } of rows) {
      // RFC 9562 §5.7: a 48-bit Unix-millisecond timestamp, version 7, variant binary 10.
      expect(id).toMatch(/^[0-9a-f]{8}-[0-9a-f]{4}-7[0-9a-f]{3}-[89ab][0-9a-f]{3}-[0-9a-f]{12}$/);
      const stampMs = Number.parseInt(id.slice(0, 8) + id.slice(9, 13), 16);
      expect(stampMs).toBeGreaterThanOrEqual(before);
      expect(stampMs).toBeLessThanOrEqual(Date.now());
    }
  });

  it("honours Idempotency-Key", async () => {
    const csv = "date,g,s\n2017-01-01,1,1\n";
    const headers = { "idempotency-key": "import-once-0001" };
    const first = await postCsv(csv, { userId: alice.user.id, q: query({}, alice.instrument!.id), headers });
    const again = await postCsv(csv, { userId: alice.user.id, q: query({}, alice.instrument!.id), headers });
    expect(first.status).toBe(201);
    expect(again.status).toBe(201);
    expect(again.headers.get("idempotent-replayed")).toBe("true");
    expect(await again.json()).toEqual(await first.json());
  });
});
