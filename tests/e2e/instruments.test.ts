import type { BrowserContext, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";

import { newPage, openBrowser, screenshot, signIn } from "./browser";

const baseUrl = inject("baseUrl");
const NAME = "E2E porch mirror";

/** The caller's instruments as the API lists them, read from inside the signed-in page. */
async function listInstrumentNames(page: Page): Promise<string[]> {
  return page.evaluate(async () => {
    const res = await fetch("/api/v1/instruments");
    const body = (await res.json()) as { data: Array<{ name: string }> };
    return body.data.map((i) => i.name);
  });
}

async function chooseUnits(page: Page, label: "Metric" | "Imperial") {
  const button = page.getByRole("group", { name: "Units" }).getByRole("button", { name: label });
  if ((await button.getAttribute("aria-pressed")) !== "true") {
    await button.click();
    await page.waitForFunction(
      (text) =>
        [...document.querySelectorAll('[role="group"][aria-label="Units"] button')].some(
          (b) => b.textContent === text && b.getAttribute("aria-pressed") === "true",
        ),
      label,
    );
  }
}

describe("an observer adds a mirror in imperial units and plans its projection", () => {
  let browser: BrowserContext;
  let page: Page;
  let instrumentPath = "";

  beforeAll(async () => {
    browser = await openBrowser();
    page = await newPage(browser);
    await signIn(page, baseUrl, "observer@example.test");
  });

  afterAll(async () => {
    // Leave the demo observer as other tests expect: metric, and without the test's instrument.
    if (instrumentPath) {
      await page.evaluate(async (path) => {
        await fetch(`/api/v1${path}`, { method: "DELETE" });
      }, instrumentPath);
    }
    await page.goto(`${baseUrl}/instruments`);
    await chooseUnits(page, "Metric");
    await browser.close();
  });

  it("shows a message beside the mask when it is larger than the mirror, and stores nothing", async () => {
    await page.goto(`${baseUrl}/instruments/new`);
    await page.getByLabel("Solar safety").waitFor();
    await chooseUnits(page, "Imperial");
    await page.getByLabel("Mirror projection").check();
    // The mirror's own caution comes first once the kind is a mirror.
    await expect(page.getByTestId("safety-emphasis").textContent()).resolves.toMatch(/roads and walkways/);
    await expect(page.getByTestId("throwDistanceMm-unit").textContent()).resolves.toBe("ft");
    await expect(page.getByTestId("maskDiameterMm-unit").textContent()).resolves.toBe("in");

    await page.fill("#name", NAME);
    await page.fill("#mirrorSizeMm", "4");
    await page.fill("#maskDiameterMm", "6");
    await page.fill("#throwDistanceMm", "35");
    await page.fill("#incidenceAngleDeg", "20");
    await page.selectOption("#surface", "second");
    await page.getByRole("button", { name: "Add instrument" }).click();

    const error = page.locator("#maskDiameterMm-error");
    await error.waitFor();
    await expect(error.textContent()).resolves.toBe(
      "The mask opening (6 in) can't be larger than the mirror (4 in).",
    );
    await expect(page.locator("#maskDiameterMm").getAttribute("aria-invalid")).resolves.toBe("true");
    await screenshot(page, "instrument-mask-error");
    expect(await listInstrumentNames(page)).not.toContain(NAME);
  });

  it("saves once the mask is fixed", async () => {
    await page.fill("#maskDiameterMm", "0.25");
    await expect(page.locator("#maskDiameterMm-error").count()).resolves.toBe(0);
    await expect(page.getByTestId("disk-preview").textContent()).resolves.toMatch(/disk is 3\.\d+ in across/);
    await page.getByRole("button", { name: "Add instrument" }).click();
    await page.waitForURL(/\/instruments\/[^/]+\?saved=1$/);
    instrumentPath = new URL(page.url()).pathname;
    await page.getByText("Instrument saved.").waitFor();
    // Shown back in the units it was typed in.
    const setUp = await page.locator("dl").first().textContent();
    expect(setUp).toContain("0.25 in");
    expect(setUp).toContain("35 ft");
    expect(await listInstrumentNames(page)).toContain(NAME);
    await screenshot(page, "instrument-saved");
  });

  it("opens the planner and shows the disk diameter, the warnings and the diagram", async () => {
    await page.getByRole("link", { name: "Plan a projection" }).click();
    await page.waitForURL(`**${instrumentPath}/plan`);
    const disk = page.getByTestId("plan-disk-diameter");
    await disk.waitFor();
    // 35 ft × the Sun's ~32′ is about 3.9 in (common practice: ~4 in at 10–12 m).
    const diskText = (await disk.textContent()) ?? "";
    const inches = Number(/([\d.]+) in/.exec(diskText)?.[1]);
    expect(inches).toBeGreaterThan(3.7);
    expect(inches).toBeLessThan(4.1);

    const warnings = page.getByTestId("plan-warnings");
    await expect(warnings.locator('[data-code="second-surface-ghost"]').count()).resolves.toBe(1);
    await expect(page.getByTestId("safety-emphasis").textContent()).resolves.toMatch(/mirror/);
    await page.getByTestId("diagram-side").waitFor();
    await page.getByTestId("diagram-face").waitFor();

    // Turning the mirror to a glancing angle adds a warning at once, without saving anything.
    await page.fill("#incidenceAngleDeg", "70");
    await warnings.locator('[data-code="glancing-incidence"]').waitFor();
    await screenshot(page, "planner-mirror-imperial");
    expect(await listInstrumentNames(page)).toContain(NAME);
  });

  it("plans the same instrument from the Projection planner page", async () => {
    await page.goto(`${baseUrl}/planner`);
    await page.getByRole("link", { name: NAME }).click();
    await page.getByTestId("plan-disk-diameter").waitFor();
    await expect(page.getByTestId("plan-disk-diameter").textContent()).resolves.toMatch(/3\.\d+ in/);
    await expect(
      page.getByTestId("plan-warnings").locator('[data-code="glancing-incidence"]').count(),
    ).resolves.toBe(0);
  });
});
