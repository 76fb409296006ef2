import { mkdirSync, mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";

import { chromium, type BrowserContext, type Page } from "playwright-core";

export const DEMO_PASSWORD = "heliotally-demo";

export function chromiumPath(): string {
  return process.env.CHROMIUM_PATH ?? "/usr/bin/chromium";
}

/**
 * Debian's Chromium with a fresh profile. The networking flags stop it from
 * reaching out to the internet in the background.
 */
export async function openBrowser(): Promise<BrowserContext> {
  const profile = mkdtempSync(path.join(tmpdir(), "heliotally-chromium-"));
  const context = await chromium.launchPersistentContext(profile, {
    executablePath: chromiumPath(),
    headless: true,
    viewport: { width: 1280, height: 900 },
    args: [
      "--no-sandbox",
      "--disable-gpu",
      "--disable-quic",
      "--no-first-run",
      "--disable-background-networking",
      "--disable-component-update",
      "--disable-sync",
    ],
  });
  // The profile folder goes once the browser has exited (close() waits for that).
  const close = context.close.bind(context);
  context.close = async (...args) => {
    await close(...args);
    try {
      rmSync(profile, { recursive: true, force: true, maxRetries: 3 });
    } catch {
      // A leftover temporary folder is not worth failing a test for.
    }
  };
  return context;
}

export async function newPage(context: BrowserContext): Promise<Page> {
  const page = context.pages()[0] ?? (await context.newPage());
  page.setDefaultTimeout(30_000);
  return page;
}

export async function signIn(page: Page, baseUrl: string, email: string, password = DEMO_PASSWORD) {
  await page.goto(`${baseUrl}/sign-in`);
  await page.fill("#email", email);
  await page.fill("#password", password);
  await page.getByRole("button", { name: "Sign in", exact: true }).click();
  await page.waitForURL((url) => !url.pathname.startsWith("/sign-in"), { timeout: 60_000 });
}

/** Screenshots land in test-results/ for a person to look at. */
export async function screenshot(page: Page, name: string) {
  const folder = path.join(process.cwd(), "test-results", "screens");
  mkdirSync(folder, { recursive: true });
  await page.screenshot({ path: path.join(folder, `${name}.png`), fullPage: true });
}
