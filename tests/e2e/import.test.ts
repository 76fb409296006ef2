import type { BrowserContext } from "playwright-core";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";

import { newPage, openBrowser, screenshot, signIn } from "./browser";

const baseUrl = inject("baseUrl");

// An old paper logbook typed into a spreadsheet (invented counts): German
// headers, semicolons, day.month.year dates and local times.
const LOGBOOK = [
  "Datum;Zeit;g;s;Bemerkung",
  "03.04.1998;10:15;2;9;leichter Dunst",
  "04.04.1998;10:40;3;14;",
  "05.04.1998;09:55;0;0;fleckenfrei",
].join("\n");

describe("an observer imports an old logbook through the browser", () => {
  let context: BrowserContext;
  beforeAll(async () => {
    context = await openBrowser();
  });
  afterAll(async () => {
    await context.close();
  });

  it("recognises the columns, previews R, imports, and lists the rows in the Logbook", async () => {
    const page = await newPage(context);
    await signIn(page, baseUrl, "observer@example.test");
    await page.goto(`${baseUrl}/logbook/import`);
    await page.setInputFiles("#logbook-file", {
      name: "altes-logbuch.csv",
      mimeType: "text/csv",
      buffer: Buffer.from(LOGBOOK),
    });

    await page.getByText("How to read it").waitFor();
    await expect(page.locator("#import-delimiter").inputValue()).resolves.toBe("semicolon");
    await expect(page.locator("#column-date").inputValue()).resolves.toBe("1");
    await expect(page.locator("#column-notes").inputValue()).resolves.toBe("5");
    await expect(page.locator("#import-date-format").inputValue()).resolves.toBe("dd.mm.yyyy");
    await page.selectOption("#import-time-zone", "Europe/Berlin");
    await page.selectOption("#import-default-seeing", "3");

    const preview = page.getByTestId("import-preview");
    await preview.waitFor();
    const firstRow = await preview.locator("tbody tr").first().locator("td").allTextContents();
    // 10:15 in Berlin on 3 April 1998 (summer time, UT+2) is 08:15 UT.
    expect(firstRow).toEqual(expect.arrayContaining(["1998-04-03 08:15 UT", "2", "9"]));
    await screenshot(page, "observer-import-preview");

    await page.getByRole("button", { name: "Import the whole file" }).click();
    await expect(page.getByTestId("import-done").textContent()).resolves.toContain("3 counts imported");
    await screenshot(page, "observer-import-done");

    await page.goto(`${baseUrl}/logbook`);
    await page.getByLabel("From date").fill("1998-04-01");
    await page.getByLabel("To date").fill("1998-04-30");
    await page.locator("tbody tr").filter({ hasText: "1998-04-04" }).waitFor();
    await expect(page.locator("tbody tr").count()).resolves.toBe(3);
    const row = await page
      .locator("tbody tr")
      .filter({ hasText: "1998-04-04" })
      .locator("td")
      .allTextContents();
    expect(row).toEqual(expect.arrayContaining(["3", "14"]));
    await screenshot(page, "observer-logbook-imported");
  });

  it("refuses a file with a bad line and stores nothing", async () => {
    const page = await newPage(context);
    await page.goto(`${baseUrl}/logbook/import`);
    const bad = ["date,g,s", "1997-06-01,2,9", "1997-06-02,5,3"].join("\n");
    await page.setInputFiles("#logbook-file", {
      name: "bad.csv",
      mimeType: "text/csv",
      buffer: Buffer.from(bad),
    });
    await page.selectOption("#import-default-seeing", "2");
    await page.getByRole("button", { name: "Import the whole file" }).click();
    const report = page.getByTestId("import-report");
    await report.waitFor();
    await expect(report.textContent()).resolves.toContain("nothing was imported");
    await expect(report.locator("tbody tr").first().textContent()).resolves.toContain(
      "Fewer spots than groups",
    );
  });
});
