import { count } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";

import { GET as list, POST as post } from "@/app/api/v1/reference-series/route";
import { getDb } from "@/db/client";
import { referenceSeries, referenceValues } from "@/db/schema";

import { apiRequest, makeUser } from "./support";

let coordinator: Awaited<ReturnType<typeof makeUser>>;
let admin: Awaited<ReturnType<typeof makeUser>>;
let observer: Awaited<ReturnType<typeof makeUser>>;

const body = (csv: string, overrides: Record<string, unknown> = {}) => ({
  name: "Invented test reference",
  licence: "CC BY 4.0 (test)",
  source: "Generated in the test",
  csv,
  ...overrides,
});

/** userId null: signed out. */
async function importCsv(payload: unknown, userId: string | null = coordinator.user.id) {
  return post(
    await apiRequest("/api/v1/reference-series", {
      method: "POST",
      body: payload,
      userId: userId ?? undefined,
    }),
  );
}

async function stored() {
  const [series] = await getDb().select({ n: count() }).from(referenceSeries);
  const [values] = await getDb().select({ n: count() }).from(referenceValues);
  return { series: series!.n, values: values!.n };
}

/** Imports a file that must be refused; returns the issue messages and checks nothing was stored. */
async function expectRefused(csv: string): Promise<string[]> {
  const before = await stored();
  const res = await importCsv(body(csv));
  expect(res.status).toBe(400);
  const json = await res.json();
  expect(json.error.code).toBe("invalid_input");
  expect(await stored()).toEqual(before);
  return json.error.issues.map((i: { path: string; message: string }) => `${i.path} ${i.message}`);
}

beforeAll(async () => {
  coordinator = await makeUser({ role: "coordinator" });
  admin = await makeUser({ role: "admin" });
  observer = await makeUser({ role: "observer" });
});

describe("POST /api/v1/reference-series", () => {
  it("imports a good file whole, with its name and licence", async () => {
    const csv = 'date,value\n2024-01-02,41.5\n2024-01-01,38\n"2024-01-03","0"\n';
    const res = await importCsv(body(csv));
    expect(res.status).toBe(201);
    expect(await res.json()).toMatchObject({
      name: "Invented test reference",
      licence: "CC BY 4.0 (test)",
      source: "Generated in the test",
      firstDay: "2024-01-01",
      lastDay: "2024-01-03",
      days: 3,
    });
    expect(await stored()).toEqual({ series: 1, values: 3 });
    // An admin stands in for a coordinator; the columns may come in either order.
    const swapped = await importCsv(body("Value,Date\r\n12,2024-02-01\r\n"), admin.user.id);
    expect(swapped.status).toBe(201);
    const listed = await (
      await list(await apiRequest("/api/v1/reference-series", { userId: coordinator.user.id }))
    ).json();
    expect(listed.data).toHaveLength(2);
  });

  it("refuses bad dates", async () => {
    const issues = await expectRefused("date,value\n2024-02-30,10\n14/03/2024,12\n,5\n2024-03-01,7\n");
    expect(issues).toEqual([
      'csv.2 Row 2: Bad date: "2024-02-30" is not a calendar day written YYYY-MM-DD.',
      'csv.3 Row 3: Bad date: "14/03/2024" is not a calendar day written YYYY-MM-DD.',
      "csv.4 Row 4: Bad date: the date is missing.",
    ]);
  });

  it("refuses duplicate days, naming the first row", async () => {
    expect(await expectRefused("date,value\n2024-01-01,10\n2024-01-02,11\n2024-01-01,12\n")).toEqual([
      "csv.4 Row 4: Duplicate day: 2024-01-01 is already on row 2.",
    ]);
  });

  it("refuses negative values", async () => {
    expect(await expectRefused("date,value\n2024-01-01,-3\n2024-01-02,4\n")).toEqual([
      "csv.2 Row 2: Negative value: -3; a relative number is never below 0.",
    ]);
  });

  it("refuses non-numeric cells", async () => {
    expect(
      await expectRefused("date,value\n2024-01-01,twelve\n2024-01-02,NaN\n2024-01-03,1 000\n2024-01-04,\n"),
    ).toEqual([
      'csv.2 Row 2: Not a number: "twelve".',
      'csv.3 Row 3: Not a number: "NaN".',
      'csv.4 Row 4: Not a number: "1 000".',
      "csv.5 Row 5: Not a number: the value is missing.",
    ]);
  });

  it("refuses the wrong columns, in the header or in a row", async () => {
    expect(await expectRefused("day,number\n2024-01-01,3\n")).toEqual([
      'csv.1 Row 1: Wrong columns: the header must name exactly two columns, date and value; found "day", "number".',
    ]);
    expect(await expectRefused("date,value,observer\n2024-01-01,3,x\n")).toEqual([
      'csv.1 Row 1: Wrong columns: the header must name exactly two columns, date and value; found "date", "value", "observer".',
    ]);
    expect(await expectRefused("date,value\n2024-01-01,3,extra\n2024-01-02\n")).toEqual([
      "csv.2 Row 2: Wrong columns: expected 2 cells (date, value), found 3.",
      "csv.3 Row 3: Wrong columns: expected 2 cells (date, value), found 1.",
    ]);
  });

  it("lists every problem of a file at once and stores none of its good rows", async () => {
    const issues = await expectRefused(
      "date,value\n2024-01-01,3\n2024-01-02,-1\n2024-01-03,4\n2024-01-03,5\n",
    );
    expect(issues).toHaveLength(2);
  });

  it("refuses an empty file, a header alone, and missing name or licence", async () => {
    const before = await stored();
    const empty = await importCsv(body(""));
    expect((await empty.json()).error.issues).toEqual([{ path: "csv", message: "Choose a CSV file." }]);
    expect(await expectRefused("date,value\n")).toEqual(["csv.2 Row 2: No data rows below the header."]);
    const unnamed = await importCsv(body("date,value\n2024-01-01,3\n", { name: "  ", licence: "" }));
    expect(unnamed.status).toBe(400);
    expect((await unnamed.json()).error.issues.map((i: { path: string }) => i.path).sort()).toEqual([
      "licence",
      "name",
    ]);
    expect(await stored()).toEqual(before);
  });

  it("is for coordinators and admins only", async () => {
    const before = await stored();
    expect((await importCsv(body("date,value\n2024-01-01,3\n"), null)).status).toBe(401);
    expect((await importCsv(body("date,value\n2024-01-01,3\n"), observer.user.id)).status).toBe(403);
    expect(
      (await list(await apiRequest("/api/v1/reference-series", { userId: observer.user.id }))).status,
    ).toBe(403);
    expect(await stored()).toEqual(before);
  });
});
