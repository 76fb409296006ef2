/**
 * An observer logs a count with a disk photo: the photo is checked in the
 * browser, analysed in a Web Worker, the proposed limb and spot candidates
 * are accepted one decision at a time, the count is saved, and the photo is
 * uploaded through the SDK to the local photo store that serve.ts started.
 */
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";

import type { BrowserContext } from "playwright-core";
import sharp from "sharp";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";

import { makeSyntheticDisk } from "../support/synthetic-disk";
import { newPage, openBrowser, screenshot, signIn } from "./browser";

const baseUrl = inject("baseUrl");

const SPOTS = [
  { xPx: 700, yPx: 500, radiusPx: 14 },
  { xPx: 1000, yPx: 760, radiusPx: 10 },
  { xPx: 600, yPx: 800, radiusPx: 7 },
];

describe("an observer logs a count with a disk photo and accepts the proposed marks", () => {
  let browser: BrowserContext;
  let photoPath: string;
  let notAPhotoPath: string;
  let folder: string;

  beforeAll(async () => {
    folder = mkdtempSync(path.join(tmpdir(), "heliotally-photo-e2e-"));
    const gray = makeSyntheticDisk({
      width: 1600,
      height: 1200,
      centreXPx: 820,
      centreYPx: 590,
      radiusPx: 520,
      spots: SPOTS,
    });
    photoPath = path.join(folder, "disk.jpg");
    await sharp(Buffer.from(gray.data.buffer), { raw: { width: 1600, height: 1200, channels: 1 } })
      .toColourspace("srgb")
      .withExif({ IFD2: { DateTimeOriginal: "2026:03:14 10:29:00", OffsetTimeOriginal: "+01:00" } })
      .jpeg({ quality: 88 })
      .toFile(photoPath);
    notAPhotoPath = path.join(folder, "notes.jpg");
    writeFileSync(notAPhotoPath, "Clear sky, four groups. This is text, not a photo.");
    browser = await openBrowser();
  });
  afterAll(async () => {
    await browser.close();
    rmSync(folder, { recursive: true, force: true });
  });

  it("refuses a text file renamed .jpg beside the field", async () => {
    const page = await newPage(browser);
    await signIn(page, baseUrl, "observer@example.test");
    await page.goto(`${baseUrl}/logbook/new`);
    await page.setInputFiles("#photo", notAPhotoPath);
    await expect(page.locator("#photo-error").textContent()).resolves.toContain(
      "not a JPEG, PNG, WebP or TIFF",
    );
  });

  it("proposes the limb and the spots, saves the count and stores the photo", async () => {
    const page = await newPage(browser);
    await page.goto(`${baseUrl}/logbook/new`);
    await page.setInputFiles("#photo", photoPath);

    // The capture time (10:29 at UTC+1) is offered as the observation time.
    await page.getByRole("button", { name: "Use this time" }).click();
    await expect(page.locator("#utDate").inputValue()).resolves.toBe("2026-03-14");
    await expect(page.locator("#utTime").inputValue()).resolves.toBe("09:29");

    await page.getByRole("button", { name: "Accept disk edge" }).waitFor({ timeout: 60_000 });
    const candidates = page.getByTestId("spot-candidate");
    expect(await candidates.count()).toBeGreaterThanOrEqual(SPOTS.length);
    // Nothing counts before it is accepted.
    await expect(page.getByText(/as the spot count/).count()).resolves.toBe(0);
    await screenshot(page, "photo-proposed");

    await page.getByRole("button", { name: "Accept disk edge" }).click();
    await page.getByText("Disk edge accepted.").waitFor();
    await page.getByRole("button", { name: /^Accept the \d+ left$/ }).click();
    const decisions = await candidates.evaluateAll((rows) =>
      rows.map((row) => row.getAttribute("data-decision")),
    );
    expect(new Set(decisions)).toEqual(new Set(["accepted"]));

    await page.getByRole("button", { name: /as the spot count/ }).click();
    await expect(page.locator("#spots").inputValue()).resolves.toBe(String(decisions.length));
    await page.fill("#groups", "3");
    await screenshot(page, "photo-accepted");

    await page.getByRole("button", { name: "Save count" }).click();
    await page.getByText("Count saved").waitFor();
    await page.getByText("Photo stored with the count.").waitFor({ timeout: 60_000 });
    await screenshot(page, "photo-saved");

    await page.getByRole("link", { name: "Continue in the Disk tracer" }).click();
    await page.waitForURL(/\/trace$/);
    await page.getByText(`${decisions.length} placed`).waitFor({ timeout: 60_000 });
    await screenshot(page, "photo-in-tracer");

    await page.goto(page.url().replace(/\/trace$/, ""));
    const thumbnail = page.getByTestId("photo-thumbnail");
    await thumbnail.waitFor();
    await page.waitForFunction(
      () =>
        ((document.querySelector('[data-testid="photo-thumbnail"]') as HTMLImageElement | null)
          ?.naturalWidth ?? 0) > 0,
    );
    await expect(page.getByText("2026-03-14 09:29 UT").count()).resolves.toBeGreaterThan(0);
    await screenshot(page, "photo-observation");
  });
});
