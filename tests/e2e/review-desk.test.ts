import { createClient } from "@libsql/client";
import type { BrowserContext } from "playwright-core";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";

import { newPage, openBrowser, screenshot, signIn } from "./browser";

const baseUrl = inject("baseUrl");
const databaseUrl = inject("databaseUrl");

const NOTE =
  "E2E: this count is far above everyone else's that day. Could you check your sketch for a slipped digit?";

/**
 * The newest flagged count waiting for review whose observer can sign in by
 * e-mail (students cannot), read straight from the app's database; every
 * demo account shares the demo password.
 */
async function findFlaggedCount(): Promise<{ id: string; email: string }> {
  const client = createClient({ url: databaseUrl });
  try {
    const result = await client.execute(
      `select o.id, u.email from observations o
       join observers ob on ob.id = o.observer_id
       join users u on u.id = ob.user_id
       where o.status = 'submitted' and u.email is not null
         and exists (select 1 from observation_flags f where f.observation_id = o.id)
       order by o.created_at desc limit 1`,
    );
    const row = result.rows[0];
    if (!row || typeof row.id !== "string" || typeof row.email !== "string") {
      throw new Error("The demo seed left no flagged count waiting for review.");
    }
    return { id: row.id, email: row.email };
  } finally {
    client.close();
  }
}

/** A demo count waiting for review that was traced on the disk (no PNG saved), with its logged group count. */
async function findTracedCount(): Promise<{ id: string; groups: number }> {
  const client = createClient({ url: databaseUrl });
  try {
    const result = await client.execute(
      // One of the demo's own drawings: other tests trace counts of their own (saved with a PNG) meanwhile.
      `select o.id, o.groups from observations o join tracings t on t.observation_id = o.id
       where o.status = 'submitted' and o.source = 'demo' and t.png is null order by o.ut_date desc limit 1`,
    );
    const row = result.rows[0];
    if (!row || typeof row.id !== "string") throw new Error("The demo seed left no traced count to review.");
    return { id: row.id, groups: Number(row.groups) };
  } finally {
    client.close();
  }
}

describe("the coordinator queries a flagged count and its observer reads the note", () => {
  let coordinator: BrowserContext;
  let observer: BrowserContext;
  let target = { id: "", email: "" };

  beforeAll(async () => {
    [coordinator, observer] = await Promise.all([openBrowser(), openBrowser()]);
  });
  afterAll(async () => {
    await Promise.all([coordinator.close(), observer.close()]);
  });

  it("shows the demo's planted outliers flagged on the Review desk", async () => {
    const page = await newPage(coordinator);
    await signIn(page, baseUrl, "coordinator@example.test");
    await page.goto(`${baseUrl}/review`);
    await page.getByRole("tab", { name: /Awaiting review/ }).waitFor();
    await page.getByLabel("Flags", { exact: true }).selectOption("any");
    await page.locator('tbody tr [aria-label="Automatic flags"] li').first().waitFor();
    // Wait until the filtered page has replaced the unfiltered one.
    await page.locator('table[aria-busy="false"]').waitFor();
    // The planted slipped digits sit far above the day's network whatever the k values.
    expect(await page.locator("tbody").getByText("Far from the network").count()).toBeGreaterThan(0);
    // Every row left by the "Any flag" filter carries at least one chip.
    const rows = await page.locator("tbody tr").count();
    expect(await page.locator('tbody tr:has([aria-label="Automatic flags"])').count()).toBe(rows);
    await screenshot(page, "review-desk-flagged");
  });

  it("queries one of them with a note, which the decision history keeps", async () => {
    target = await findFlaggedCount();
    const page = await newPage(coordinator);
    // Still on the desk, filtered to flagged rows: open the chosen one from the table.
    await page.locator(`tbody a[href="/review/${target.id}"]`).click();
    await page.waitForURL(`**/review/${target.id}`);
    await page.getByRole("heading", { name: "Automatic flags" }).waitFor();

    // A query without a note is refused beside the field and sends nothing.
    await page.getByRole("button", { name: "Send a query" }).click();
    await expect(page.locator("#note-error").textContent()).resolves.toContain("Write the question");

    await page.fill("#note", NOTE);
    await page.getByRole("button", { name: "Send a query" }).click();
    await page.getByText("Queried: the observer has been told").waitFor();
    await page.getByTestId("audit-entry").filter({ hasText: NOTE }).waitFor();
    await expect(page.getByText("Question from coordinator").first().isVisible()).resolves.toBe(true);
    await screenshot(page, "review-desk-queried");
  });

  it("shows the question in the Queried tab and at the top of the Decision log", async () => {
    const page = await newPage(coordinator);
    await page.goto(`${baseUrl}/review`);
    // While it waits for its observer, the Queried tab shows what was asked.
    await page.getByRole("tab", { name: /Queried/ }).click();
    await page.getByRole("table", { name: "Queried observations" }).getByText(NOTE).waitFor();
    await screenshot(page, "review-desk-queried-tab");
    await page.getByRole("link", { name: "Decision log" }).click();
    await page.waitForURL("**/review/decisions");
    const table = page.getByRole("table", { name: "Review decisions, newest first" });
    await page.locator('table[aria-busy="false"]').waitFor();
    const newest = table.locator("tbody tr").first();
    await expect(newest.textContent()).resolves.toContain(NOTE);
    await expect(newest.getByText("Queried", { exact: true }).count()).resolves.toBe(1);
    await expect(newest.getByRole("link").getAttribute("href")).resolves.toBe(`/review/${target.id}`);

    // Filtered to rejections, the query is not there.
    await page.getByLabel("Decision", { exact: true }).selectOption("rejected");
    await expect.poll(() => table.getByText(NOTE).count(), { timeout: 10_000 }).toBe(0);
    await page.getByLabel("Decision", { exact: true }).selectOption("queried");
    await table.getByText(NOTE).waitFor();
    // The download carries the same filters and the whole question.
    const href = await page.getByRole("link", { name: "Download CSV" }).getAttribute("href");
    expect(href).toContain("action=queried");
    const csv = await page.request.get(`${baseUrl}${href}`);
    expect(csv.headers()["content-type"]).toContain("text/csv");
    expect(await csv.text()).toContain(NOTE);
    await screenshot(page, "review-decision-log");
  });

  it("shows the note in the observer's Logbook and on the count, with the form to send it back", async () => {
    const page = await newPage(observer);
    await signIn(page, baseUrl, target.email);
    await page.goto(`${baseUrl}/logbook`);
    // Their k was fitted for their instrument at set-up; the Logbook says which one is in use.
    await page.getByText(/Your current k is \d\.\d{3}\./).waitFor();
    const inbox = page.getByRole("region", { name: /From your coordinator/ });
    await inbox.getByText(NOTE, { exact: false }).waitFor();
    await screenshot(page, "logbook-inbox");

    await inbox.getByRole("link", { name: "Open the count" }).first().click();
    await page.waitForURL(`**/logbook/${target.id}`);
    await expect(page.getByTestId("coordinator-note").textContent()).resolves.toContain(NOTE);
    await page.getByRole("button", { name: "Send back for review" }).waitFor();
    await screenshot(page, "logbook-queried-count");

    // Opening the count marked the message read: it has left the inbox.
    await page.goto(`${baseUrl}/logbook`);
    await page.getByRole("heading", { name: "Logbook", exact: true }).waitFor();
    await expect(page.getByText(NOTE, { exact: false }).count()).resolves.toBe(0);
  });
});

describe("the coordinator checks a traced count against its tracing", () => {
  let coordinator: BrowserContext;
  beforeAll(async () => {
    coordinator = await openBrowser();
  });
  afterAll(async () => {
    await coordinator.close();
  });

  it("shows the drawing, its measured groups and whether the logged counts agree", async () => {
    const traced = await findTracedCount();
    const page = await newPage(coordinator);
    await signIn(page, baseUrl, "coordinator@example.test");
    await page.goto(`${baseUrl}/review/${traced.id}`);
    const section = page.getByRole("region", { name: "Disk tracing" });
    // The demo's tracings carry no PNG: the drawing comes from the saved positions.
    await section.getByTestId("tracing-drawing").waitFor();
    await expect(section.getByRole("img").getAttribute("aria-label")).resolves.toContain(
      `${traced.groups} groups`,
    );
    await expect(section.getByTestId("tracing-groups").locator("tbody tr").count()).resolves.toBe(
      traced.groups,
    );
    await section.getByText("The logged counts match the tracing.").waitFor();
    // Reading only: the coordinator is not offered the observer's tracer.
    await expect(section.getByRole("link", { name: /Disk tracer|Trace the disk/ }).count()).resolves.toBe(0);
    await screenshot(page, "review-traced-count");

    // On to the next count waiting, without going back to the desk.
    await page.getByRole("link", { name: "Next waiting count →" }).click();
    await page.waitForURL((url) => url.pathname.startsWith("/review/") && !url.pathname.endsWith(traced.id));
    await page.getByRole("heading", { name: "Decision", exact: true }).waitFor();
  });
});
