import type { BrowserContext } from "playwright-core";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";

import { newPage, openBrowser, screenshot, signIn } from "./browser";

const baseUrl = inject("baseUrl");

describe("an observer logs today's count and a coordinator sees it arrive", () => {
  let observer: BrowserContext;
  let coordinator: BrowserContext;
  beforeAll(async () => {
    [observer, coordinator] = await Promise.all([openBrowser(), openBrowser()]);
  });
  afterAll(async () => {
    await Promise.all([observer.close(), coordinator.close()]);
  });

  it("shows a clear message beside the field for a bad count and saves nothing", async () => {
    const page = await newPage(observer);
    await signIn(page, baseUrl, "observer@example.test");
    await page.goto(`${baseUrl}/logbook/new`);
    await page.fill("#groups", "5");
    await page.fill("#spots", "3");
    await page.getByRole("button", { name: "Save count" }).click();
    await expect(page.locator("#spots-error").textContent()).resolves.toContain("Fewer spots than groups");
    await expect(page.getByText("Count saved").count()).resolves.toBe(0);
  });

  it("logs a count, shows R, and lists it in the Logbook", async () => {
    const page = await newPage(observer);
    await page.goto(`${baseUrl}/logbook/new`);
    await page.getByText("Safety", { exact: false }).first().waitFor();
    await page.fill("#groups", "4");
    await page.fill("#spots", "23");
    // The demo observer's k is computed at seed time; R = k(10·4 + 23) = 63k.
    const kText = await page.getByText(/Relative number with k = /).textContent();
    const k = Number(/k = ([\d.]+)/.exec(kText ?? "")?.[1]);
    expect(k).toBeGreaterThan(0.3);
    const preview = Number(
      /R = ([\d.]+)/.exec((await page.getByTestId("r-preview").textContent()) ?? "")?.[1],
    );
    // k is shown to two decimals, R is computed with the full k.
    expect(Math.abs(preview - 63 * k)).toBeLessThan(63 * 0.005 + 0.05);
    await page.fill("#notes", "E2E: thin cirrus to the west");
    await screenshot(page, "observer-log-form");
    await page.getByRole("button", { name: "Save count" }).click();
    await page.getByText("Count saved").waitFor();
    await expect(page.getByRole("status").first().textContent()).resolves.toContain(
      `R = ${preview.toFixed(1)}`,
    );

    await page.getByRole("link", { name: "Open the Logbook" }).click();
    await page.waitForURL("**/logbook");
    // Other test files log counts for the same observer at the same moment
    // (the Disk tracer's), so find ours by its relative number.
    const ours = page
      .locator("tbody tr")
      .filter({ hasText: preview.toFixed(1) })
      .first();
    await ours.getByText("Awaiting review").waitFor();
    const cells = await ours.locator("td").allTextContents();
    expect(cells).toEqual(expect.arrayContaining(["4", "23", preview.toFixed(1)]));
    await screenshot(page, "observer-logbook");
  });

  it("appears at the top of the coordinator's Review desk", async () => {
    const page = await newPage(coordinator);
    await signIn(page, baseUrl, "coordinator@example.test");
    await page.goto(`${baseUrl}/review`);
    await page.getByRole("table").waitFor({ state: "visible" });
    // Among the newest arrivals (the Disk tracer's test may log one alongside).
    await page.locator("tbody tr").filter({ hasText: "Wren Halloway" }).first().waitFor();
    const newest = await page
      .locator("tbody tr")
      .evaluateAll((rows) => rows.slice(0, 3).map((row) => row.textContent ?? ""));
    expect(newest.some((text) => text.includes("Wren Halloway") && text.includes("63"))).toBe(true);
    await screenshot(page, "coordinator-review");
  });
});
