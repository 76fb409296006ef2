import type { BrowserContext } from "playwright-core";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";

import { newPage, openBrowser, screenshot, signIn } from "./browser";

const baseUrl = inject("baseUrl");

describe("each demo role signs in and lands on its own start page", () => {
  let context: BrowserContext;
  beforeAll(async () => {
    context = await openBrowser();
  });
  afterAll(async () => {
    await context.close();
  });

  it.each([
    ["observer@example.test", "/logbook", "Logbook"],
    ["coordinator@example.test", "/review", "Review desk"],
    ["educator@example.test", "/classrooms", "Classrooms"],
    ["admin@example.test", "/admin", "Users and roles"],
  ])("%s", async (email, home, heading) => {
    await context.clearCookies();
    const page = await newPage(context);
    await signIn(page, baseUrl, email);
    await page.waitForURL(`**${home}`);
    await expect(page.getByRole("heading", { level: 1 }).textContent()).resolves.toContain(heading);
    await expect(page.getByText("invented for demonstration").isVisible()).resolves.toBe(true);
    await screenshot(page, `role-${email.split("@")[0]}`);
  });

  it("refuses an observer the coordinator's page with a 403 page", async () => {
    await context.clearCookies();
    const page = await newPage(context);
    await signIn(page, baseUrl, "observer@example.test");
    const response = await page.goto(`${baseUrl}/review`);
    expect(response?.status()).toBe(403);
    await expect(page.getByRole("heading", { level: 1 }).textContent()).resolves.toContain(
      "belongs to another role",
    );
    await screenshot(page, "observer-refused-review");
  });

  it("sends a signed-out visitor to sign-in", async () => {
    await context.clearCookies();
    const page = await newPage(context);
    await page.goto(`${baseUrl}/logbook`);
    await page.waitForURL("**/sign-in**");
    expect(new URL(page.url()).pathname).toBe("/sign-in");
  });

  it("shows a clear message for a wrong password", async () => {
    await context.clearCookies();
    const page = await newPage(context);
    await page.goto(`${baseUrl}/sign-in`);
    await page.fill("#email", "educator@example.test");
    await page.fill("#password", "not the password");
    await page.getByRole("button", { name: "Sign in", exact: true }).click();
    await expect(page.locator("form [role=alert]").first().textContent()).resolves.toContain(
      "do not match an account",
    );
  });
});
