import type { BrowserContext, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";

import { newPage, openBrowser, screenshot, signIn } from "./browser";

const baseUrl = inject("baseUrl");

const hhmm = (at: Date) => at.toISOString().slice(11, 16);

/** A session window that is open now and stays on today's UT day (the form wants one day). */
async function openWindowNow(): Promise<{ day: string; opens: string; closes: string }> {
  let now = new Date();
  const minutesLeft = 24 * 60 - (now.getUTCHours() * 60 + now.getUTCMinutes());
  if (minutesLeft < 15) {
    // Too close to midnight UT for a same-day window: wait for the new day.
    await new Promise((r) => setTimeout(r, (minutesLeft + 1) * 60_000));
    now = new Date();
  }
  const opens = new Date(
    Math.max(now.getTime() - 10 * 60_000, Date.parse(`${now.toISOString().slice(0, 10)}T00:00:00Z`)),
  );
  const closes = new Date(
    Math.min(now.getTime() + 60 * 60_000, Date.parse(`${now.toISOString().slice(0, 10)}T23:59:00Z`)),
  );
  return { day: now.toISOString().slice(0, 10), opens: hhmm(opens), closes: hhmm(closes) };
}

async function signInStudent(page: Page, { code, name, pin }: { code: string; name: string; pin: string }) {
  await page.fill("#class-code", code);
  await page.fill("#class-name", name);
  await page.fill("#class-pin", pin);
  await page.getByRole("button", { name: "Sign in to my class" }).click();
}

async function logCount(page: Page, { groups, spots }: { groups: number; spots: number }) {
  await page.getByRole("link", { name: "Log my count" }).first().click();
  await page.waitForURL("**/class/sessions/**");
  // Every classroom session page carries the supervised-class safety notice.
  await page.getByText("An adult supervises every class session").waitFor();
  await page.fill("#groups", String(groups));
  await page.fill("#spots", String(spots));
  await page.getByRole("button", { name: "Save count" }).click();
  await page.getByTestId("own-count").waitFor();
}

describe("a class counts together: the educator sets up, two students log, the class is compared", () => {
  let educator: BrowserContext;
  let first: BrowserContext;
  let second: BrowserContext;
  let code = "";
  let classroomUrl = "";
  const cards = new Map<string, string>();
  const className = `E2E class ${Date.now().toString(36)}`;

  beforeAll(async () => {
    [educator, first, second] = await Promise.all([openBrowser(), openBrowser(), openBrowser()]);
  });
  afterAll(async () => {
    await Promise.all([educator.close(), first.close(), second.close()]);
  });

  it("the educator creates a classroom, schedules a session open now and enrols two students", async () => {
    const page = await newPage(educator);
    await signIn(page, baseUrl, "educator@example.test");
    await page.goto(`${baseUrl}/classrooms`);
    const today = new Date();
    const termEnd = new Date(today.getTime() + 60 * 86_400_000).toISOString().slice(0, 10);
    await page.fill("#name", className);
    await page.fill("#school", "E2E school");
    await page.fill("#termStart", new Date(today.getTime() - 7 * 86_400_000).toISOString().slice(0, 10));
    await page.fill("#termEnd", termEnd);
    await page.getByRole("button", { name: "Create classroom" }).click();
    await page.waitForURL(/\/classrooms\/[0-9a-f-]{36}$/);
    classroomUrl = page.url();
    code = (await page.getByTestId("classroom-code").textContent())?.trim() ?? "";
    expect(code).toMatch(/^SUN-[34679ACDEFGHJKMNPQRTWXY]{4}$/);

    // A window that closes before it opens is refused beside the field.
    const window = await openWindowNow();
    await page.fill("#session-title", "E2E: first count");
    await page.fill("#session-day", window.day);
    await page.fill("#session-opens", window.closes);
    await page.fill("#session-closes", window.opens);
    await page.getByRole("button", { name: "Schedule session" }).click();
    await expect(page.locator("#session-closes-error").textContent()).resolves.toContain(
      "must close after it opens",
    );

    await page.fill("#session-opens", window.opens);
    await page.fill("#session-closes", window.closes);
    await page.getByRole("button", { name: "Schedule session" }).click();
    await page.getByText("“E2E: first count” is scheduled.").waitFor();
    await page.getByRole("link", { name: "E2E: first count" }).waitFor();

    await page.fill("#displayNames", "Avery E.\nBlake E.");
    await page.getByRole("button", { name: "Enrol and make sign-in cards" }).click();
    await page.waitForURL("**/cards");
    await page.getByTestId("sign-in-card").first().waitFor();
    const names = await page.getByTestId("card-name").allTextContents();
    const pins = await page.getByTestId("card-pin").allTextContents();
    names.forEach((name, i) => cards.set(name.trim(), (pins[i] ?? "").trim()));
    expect([...cards.keys()].sort()).toEqual(["Avery E.", "Blake E."]);
    for (const pin of cards.values()) expect(pin).toMatch(/^\d{4}$/);
    await screenshot(page, "classroom-cards");
  });

  it("a student is told clearly when the PIN is wrong, then signs in and logs a count", async () => {
    const page = await newPage(first);
    await page.goto(`${baseUrl}/sign-in`);
    const pin = cards.get("Avery E.")!;
    await signInStudent(page, { code, name: "Avery E.", pin: pin === "4821" ? "4822" : "4821" });
    await expect(
      page.locator("form[aria-label='Student sign-in'] [role=alert]").first().textContent(),
    ).resolves.toContain("do not match anyone in this classroom");
    await signInStudent(page, { code: code.toLowerCase(), name: "avery e", pin });
    await page.waitForURL("**/class");
    await expect(page.getByRole("heading", { level: 1 }).textContent()).resolves.toBe("My class");
    await logCount(page, { groups: 4, spots: 21 });
    await expect(page.getByTestId("own-count").textContent()).resolves.toContain("10g + s = 61");
    await screenshot(page, "classroom-student-first");
  });

  it("a second student on a shared class device logs a count and hands over", async () => {
    const page = await newPage(second);
    await page.goto(`${baseUrl}/sign-in/class-device`);
    await signInStudent(page, { code, name: "Blake E.", pin: cards.get("Blake E.")! });
    await page.waitForURL("**/class");
    await logCount(page, { groups: 3, spots: 12 });
    // With both counts in, the class comparison shows, by display name.
    const table = page.getByRole("table", { name: "Counts side by side" });
    await expect(table.textContent()).resolves.toContain("Avery E.");
    await screenshot(page, "classroom-student-second");
    await page.getByRole("button", { name: "Done, next student" }).first().click();
    await page.waitForURL("**/sign-in/class-device**");
    await expect(page.locator("#class-code").inputValue()).resolves.toBe(code);
  });

  it("the educator sees the class side by side, with the median", async () => {
    const page = await newPage(educator);
    await page.goto(classroomUrl);
    await page.getByRole("link", { name: "E2E: first count" }).click();
    await page.waitForURL("**/sessions/**");
    const table = page.getByRole("table", { name: "Counts side by side" });
    const text = await table.textContent();
    expect(text).toContain("Avery E.");
    expect(text).toContain("Blake E.");
    // Median of 61 and 42.
    await expect(page.getByTestId("class-median").textContent()).resolves.toBe("51.5");
    await page.getByText("An adult supervises every class session").waitFor();
    await screenshot(page, "classroom-comparison");

    await page.goto(`${classroomUrl}/term`);
    await page.getByRole("table", { name: "k per student" }).waitFor();
    await screenshot(page, "classroom-term");
  });

  it("keeps a student out of the educator's pages, and another educator's classroom is not found", async () => {
    const student = await newPage(first);
    const asStudent = await student.goto(classroomUrl);
    expect(asStudent?.status()).toBe(403);

    // The admin stands in for an educator but owns no classroom: the page answers 404, not the classroom.
    const page = await newPage(second);
    await signIn(page, baseUrl, "admin@example.test");
    const asOtherEducator = await page.goto(classroomUrl);
    expect(asOtherEducator?.status()).toBe(404);
    await expect(page.getByText(className).count()).resolves.toBe(0);
  });
});
