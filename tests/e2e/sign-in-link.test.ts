import { createClient } from "@libsql/client";
import type { BrowserContext } from "playwright-core";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";

import { newPage, openBrowser, screenshot } from "./browser";

const baseUrl = inject("baseUrl");
const databaseUrl = inject("databaseUrl");

describe("sign-in by e-mailed link", () => {
  let context: BrowserContext;
  beforeAll(async () => {
    context = await openBrowser();
  });
  afterAll(async () => {
    await context.close();
  });

  it("mails a link through the local sink that signs the educator in", async () => {
    const page = await newPage(context);
    await page.goto(`${baseUrl}/sign-in`);
    await page.fill("#email", "educator@example.test");
    await page.getByRole("button", { name: "E-mail me a sign-in link" }).click();
    await page.getByText("a sign-in link is on its way").waitFor();

    // Read what the mail sink captured, as the admin's Mail page does.
    const db = createClient({ url: databaseUrl });
    let link: string | undefined;
    for (let i = 0; i < 40 && !link; i++) {
      const rows = await db.execute(
        "SELECT text_body FROM captured_mail WHERE to_address = 'educator@example.test' ORDER BY created_at DESC LIMIT 1",
      );
      link = /(http\S+callback\/email\S+)/.exec(String(rows.rows[0]?.text_body ?? ""))?.[1];
      if (!link) await new Promise((r) => setTimeout(r, 250));
    }
    db.close();
    expect(link).toBeTruthy();

    await page.goto(link!);
    await page.waitForURL("**/classrooms");
    await expect(page.getByText("Harbour Lane School").first().isVisible()).resolves.toBe(true);
    await screenshot(page, "educator-classrooms");
  });
});
