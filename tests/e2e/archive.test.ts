import type { BrowserContext } from "playwright-core";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";

import { newPage, openBrowser, screenshot, signIn } from "./browser";

const baseUrl = inject("baseUrl");

describe("the Archive", () => {
  let context: BrowserContext;
  beforeAll(async () => {
    context = await openBrowser();
  });
  afterAll(async () => {
    await context.close();
  });

  it("shows an observer the network's charts and a paged table", async () => {
    await context.clearCookies();
    const page = await newPage(context);
    await signIn(page, baseUrl, "observer@example.test");
    await page.getByRole("link", { name: "Archive", exact: true }).click();
    await page.waitForURL("**/archive");
    await expect(page.getByRole("heading", { level: 1 }).textContent()).resolves.toBe("Archive");
    // The demo seed fits every k and fills the series, so the charts have data.
    await page.locator("[data-testid=time-chart] canvas").first().waitFor();
    await expect(
      page.getByRole("heading", { name: "Your counts against the network" }).isVisible(),
    ).resolves.toBe(true);

    const table = page.getByRole("table", { name: /Daily relative numbers/ });
    await table.locator("tbody tr").first().waitFor();
    await expect(table.locator("tbody tr").count()).resolves.toBe(50);
    await expect(page.getByText(/entries · page 1 of \d+/).isVisible()).resolves.toBe(true);

    // Sort by relative number, largest first: the server answers the sorted page.
    const header = table.locator("th", { hasText: "Relative number" });
    for (let clicks = 0; clicks < 3 && (await header.getAttribute("aria-sort")) !== "descending"; clicks++) {
      await header.getByRole("button").click();
    }
    await expect(header.getAttribute("aria-sort")).resolves.toBe("descending");
    await page.waitForFunction(() => {
      const cells = [...document.querySelectorAll("table[aria-busy=false] tbody tr td:nth-child(2)")].map(
        (c) => Number(c.textContent),
      );
      return cells.length === 50 && cells.every((v, i) => i === 0 || cells[i - 1]! >= v);
    });

    await page.getByRole("tab", { name: "Monthly" }).click();
    await page
      .getByRole("table", { name: /Monthly relative numbers/ })
      .locator("tbody tr")
      .first()
      .waitFor();
    await screenshot(page, "archive-observer");
  });

  it("lets a coordinator start a full recompute and follow it to the end", async () => {
    await context.clearCookies();
    const page = await newPage(context);
    await signIn(page, baseUrl, "coordinator@example.test");
    await page.getByRole("link", { name: "Observers", exact: true }).click();
    await page.waitForURL("**/observers");
    // The page streams in behind its loading state: wait for the first row before counting.
    await page
      .getByRole("table", { name: /Observers with their newest k/ })
      .locator("tbody tr")
      .first()
      .waitFor();
    await expect(
      page
        .getByRole("table", { name: /Observers with their newest k/ })
        .locator("tbody tr")
        .count(),
    ).resolves.toBeGreaterThan(10);

    await page.getByRole("link", { name: "k settings and recompute" }).first().click();
    await page.waitForURL("**/observers/k-settings");
    // The demo's k values were fitted at set-up, before any recompute from this page.
    await expect(page.getByTestId("stored-k").textContent()).resolves.toMatch(
      /The \d+ k coefficients in use were fitted on \d{4}-\d\d-\d\d \d\d:\d\d UT/,
    );
    await page.getByRole("button", { name: "Recompute every k and the series" }).click();
    await page.getByText("Done", { exact: true }).waitFor({ timeout: 90_000 });
    await expect(
      page.getByRole("progressbar", { name: "Recompute progress" }).getAttribute("aria-valuenow"),
    ).resolves.toBe("100");
    await expect(page.getByTestId("recompute-message").textContent()).resolves.toMatch(
      /Recomputed \d+ k coefficients/,
    );
    await screenshot(page, "archive-recompute-done");

    await page.goto(`${baseUrl}/archive`);
    await page.locator("[data-testid=time-chart] canvas").first().waitFor();
    await page
      .getByRole("table", { name: /Daily relative numbers/ })
      .locator("tbody tr")
      .first()
      .waitFor();
  });

  it("refuses a reference file with bad rows and lists them", async () => {
    await context.clearCookies();
    const page = await newPage(context);
    await signIn(page, baseUrl, "coordinator@example.test");
    await page.goto(`${baseUrl}/observers/k-settings`);
    await page.fill("#name", "Invented e2e reference");
    await page.fill("#licence", "Test only");
    await page.setInputFiles("#file", {
      name: "reference.csv",
      mimeType: "text/csv",
      buffer: Buffer.from("date,value\n2024-01-01,10\n2024-01-01,11\n2024-02-30,-4\n"),
    });
    await page.getByRole("button", { name: "Import" }).click();
    const problems = page.getByTestId("csv-problems");
    await problems.waitFor();
    await expect(problems.textContent()).resolves.toContain(
      "Row 3: Duplicate day: 2024-01-01 is already on row 2.",
    );
    await expect(problems.textContent()).resolves.toContain("Row 4: Negative value");
    await expect(page.getByText("None imported.").isVisible()).resolves.toBe(true);
  });
});
