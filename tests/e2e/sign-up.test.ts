import type { BrowserContext } from "playwright-core";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";

import { newPage, openBrowser, screenshot, signIn } from "./browser";

const baseUrl = inject("baseUrl");

describe("joining and managing accounts in the browser", () => {
  let context: BrowserContext;
  beforeAll(async () => {
    context = await openBrowser();
  });
  afterAll(async () => {
    await context.close();
  });

  it("shows field messages, then creates an observer and opens their empty Logbook", async () => {
    const page = await newPage(context);
    await page.goto(`${baseUrl}/sign-up`);
    await page.fill("#name", "Sky Tester");
    await page.fill("#email", "not-an-address");
    await page.fill("#password", "short");
    await page.getByRole("button", { name: "Create my account" }).click();
    await expect(page.locator("#email-error").textContent()).resolves.toContain("valid e-mail");
    await expect(page.locator("#password-error").textContent()).resolves.toContain("at least 10");

    await page.fill("#email", "sky.tester@example.test");
    await page.fill("#password", "clear skies tonight");
    await page.fill("#confirmPassword", "clear skies tonight");
    await page.fill("#country", "ie");
    await page.getByRole("button", { name: "Create my account" }).click();
    await page.waitForURL("**/logbook", { timeout: 60_000 });
    await page.getByText("Your Logbook is empty").waitFor();
    await screenshot(page, "new-observer-logbook");
  });

  it("lets the admin change a role", async () => {
    await context.clearCookies();
    const page = await newPage(context);
    await signIn(page, baseUrl, "admin@example.test");
    const row = page.locator("tr", { hasText: "sky.tester@example.test" });
    await row.getByLabel("Role").selectOption("coordinator");
    await row.getByRole("button", { name: "Save" }).click();
    await expect(row.getByRole("status").textContent()).resolves.toContain("Role changed");
  });
});
