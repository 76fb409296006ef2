import type { BrowserContext, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";

import { newPage, openBrowser, screenshot, signIn } from "./browser";

const baseUrl = inject("baseUrl");

/** The drawing area on screen, and a disk centred in it. */
async function measureStage(page: Page) {
  const stage = page.getByTestId("tracer-stage");
  await stage.scrollIntoViewIfNeeded();
  const box = await stage.boundingBox();
  if (!box) throw new Error("the drawing area is not on screen");
  const r = Math.min(box.width, box.height) * 0.35;
  return { cx: box.x + box.width / 2, cy: box.y + box.height / 2, r };
}

async function drag(page: Page, path: Array<[number, number]>) {
  const [start, ...rest] = path;
  await page.mouse.move(start![0], start![1]);
  await page.mouse.down();
  for (const [x, y] of rest) await page.mouse.move(x, y, { steps: 4 });
  await page.mouse.up();
}

describe("an observer traces the disk and the counts reach the observation", () => {
  let context: BrowserContext;
  let observationUrl = "";
  beforeAll(async () => {
    context = await openBrowser();
  });
  afterAll(async () => {
    await context.close();
  });

  it("logs a count and opens the Disk tracer from it", async () => {
    const page = await newPage(context);
    await signIn(page, baseUrl, "observer@example.test");
    await page.goto(`${baseUrl}/logbook/new`);
    await page.fill("#groups", "0");
    await page.fill("#spots", "0");
    await page.fill("#notes", "E2E: traced on the disk tracer");
    await page.getByRole("button", { name: "Save count" }).click();
    await page.getByText("Count saved").waitFor();
    await page.getByRole("link", { name: "Trace the disk" }).click();
    await page.waitForURL(/\/logbook\/[^/]+\/trace$/);
    observationUrl = page.url().replace(/\/trace$/, "");
    await page.getByTestId("tracer-stage").waitFor();
    await page.getByText("Solar safety", { exact: false }).first().waitFor();
  });

  it("fits and orients the disk, places, groups and classifies spots, and saves", async () => {
    const page = await newPage(context);
    await page.getByTestId("tracer-stage").locator("canvas").first().waitFor();
    let { cx, cy, r } = await measureStage(page);

    // Bad input first: a circle from two limb points is refused with a message.
    await page.getByRole("button", { name: /Limb points/ }).click();
    await page.mouse.click(cx - r, cy);
    await page.mouse.click(cx, cy - r);
    await page.getByRole("button", { name: "Fit circle" }).click();
    await expect(page.getByTestId("tracer-notice").textContent()).resolves.toMatch(
      /at least three different points/,
    );
    await page.getByRole("button", { name: "Clear points" }).click();

    // Fit: drag a circle from the centre to the limb.
    await page.getByRole("button", { name: /Drag disk/ }).click();
    await drag(page, [
      [cx, cy],
      [cx + r / 2, cy],
      [cx + r, cy],
    ]);
    await expect(page.getByTestId("disk-status").textContent()).resolves.toMatch(/Disk: dragged/);

    // Orient: celestial north straight up.
    await page.getByRole("button", { name: /North mark/ }).click();
    await page.mouse.click(cx, cy - r * 1.1);
    await expect(page.getByTestId("orientation-status").textContent()).resolves.toMatch(/north mark/);

    // Spots: three in the north-west quadrant, two in the south-east; one outside the disk is refused.
    ({ cx, cy, r } = await measureStage(page));
    await page.getByRole("button", { name: /^Spot/ }).click();
    const north: Array<[number, number]> = [
      [0.22, -0.5],
      [0.26, -0.49],
      [0.3, -0.51],
    ];
    const south: Array<[number, number]> = [
      [-0.25, 0.48],
      [-0.21, 0.5],
    ];
    for (const [dx, dy] of [...north, ...south]) await page.mouse.click(cx + dx * r, cy + dy * r);
    await page.mouse.click(cx + r * 1.2, cy + r * 0.9);
    await expect(page.getByTestId("tracer-notice").textContent()).resolves.toMatch(
      /A spot must lie on the disk/,
    );
    await page.getByText("5 placed").waitFor();

    // Group the northern spots with a lasso, the southern ones by Shift-clicking.
    await page.getByRole("button", { name: /^Select/ }).click();
    await drag(page, [
      [cx + 0.15 * r, cy - 0.6 * r],
      [cx + 0.38 * r, cy - 0.6 * r],
      [cx + 0.38 * r, cy - 0.4 * r],
      [cx + 0.15 * r, cy - 0.4 * r],
      [cx + 0.16 * r, cy - 0.59 * r],
    ]);
    await page.getByText("3 selected").waitFor();
    await page.keyboard.press("g");
    await page.mouse.click(cx + south[0]![0] * r, cy + south[0]![1] * r);
    await page.keyboard.down("Shift");
    await page.mouse.click(cx + south[1]![0] * r, cy + south[1]![1] * r);
    await page.keyboard.up("Shift");
    await page.getByText("2 selected").waitFor();
    await page.getByRole("button", { name: "Group selected (G)" }).click();

    // Classify: only valid McIntosh classes are offered.
    await page.getByLabel("Zurich class of group 1").selectOption("C");
    const offered = await page.getByLabel("McIntosh class of group 1").locator("option").allTextContents();
    expect(offered).toContain("Cao");
    expect(offered).not.toContain("Cac"); // McIntosh 1990: C groups are never compact
    await page.getByLabel("McIntosh class of group 1").selectOption("Cao");
    await page.getByLabel("Zurich class of group 2").selectOption("B");
    await page.getByLabel("McIntosh class of group 2").selectOption("Bxo");

    // The counts follow the tracing.
    for (const [field, value] of [
      ["groups", "2"],
      ["spots", "5"],
      ["northGroups", "1"],
      ["northSpots", "3"],
      ["southGroups", "1"],
      ["southSpots", "2"],
    ]) {
      await expect(page.locator(`#count-${field}`).inputValue()).resolves.toBe(value);
    }
    // Move a spot by dragging it, then undo the move.
    const before = await page.getByTestId("group-2-position").textContent();
    const [sx, sy] = [cx + south[0]![0] * r, cy + south[0]![1] * r];
    await drag(page, [
      [sx, sy],
      [sx + 12, sy + 4],
      [sx + 24, sy + 8],
    ]);
    await expect(page.getByTestId("group-2-position").textContent()).resolves.not.toBe(before);
    await page.keyboard.press("Control+z");
    await expect(page.getByTestId("group-2-position").textContent()).resolves.toBe(before);
    await expect(page.getByTestId("group-1-position").textContent()).resolves.toMatch(/north/);
    await expect(page.getByTestId("group-2-position").textContent()).resolves.toMatch(/south/);
    await screenshot(page, "tracer-before-save");

    await page.getByRole("button", { name: "Save tracing" }).click();
    await page.getByText(/Saved \(revision 1\)/).waitFor();
    await expect(page.getByTestId("save-state").textContent()).resolves.toBe("Saved, revision 1");
  });

  it("shows the counts, the groups and the picture on the observation", async () => {
    const page = await newPage(context);
    await page.goto(observationUrl);
    await page.getByTestId("tracing-groups").waitFor();
    const details = await page.locator("dl").first().textContent();
    expect(details).toContain("Groups (g)2");
    expect(details).toContain("Spots (s)5");
    expect(details).toContain("North 1 g / 3 s · South 1 g / 2 s");
    const rows = await page.getByTestId("tracing-groups").locator("tbody tr").allTextContents();
    expect(rows).toHaveLength(2);
    expect(rows[0]).toMatch(/^13CCao/);
    expect(rows[1]).toMatch(/^22BBxo/);
    await page.getByText("The logged counts match the tracing.").waitFor();
    const picture = page.getByRole("img", { name: /Tracing of the disk with 2 groups and 5 spots/ });
    await expect(
      picture.evaluate((img: HTMLImageElement) => img.complete && img.naturalWidth > 0),
    ).resolves.toBe(true);
    await screenshot(page, "tracer-observation");
  });

  it("reopens the tracing exactly as saved", async () => {
    const page = await newPage(context);
    await page.goto(`${observationUrl}/trace`);
    await page.getByTestId("tracer-stage").locator("canvas").first().waitFor();
    await expect(page.getByTestId("save-state").textContent()).resolves.toBe("Saved, revision 1");
    await page.getByText("5 placed").waitFor();
    await expect(page.getByLabel("McIntosh class of group 1").inputValue()).resolves.toBe("Cao");
    await expect(page.getByLabel("McIntosh class of group 2").inputValue()).resolves.toBe("Bxo");
  });

  it("prints a disk template for the day", async () => {
    const page = await newPage(context);
    // The Disk template sits under "More" in the main navigation.
    await page.getByRole("button", { name: "More" }).click();
    await page.getByRole("link", { name: "Disk template" }).first().click();
    await page.waitForURL("**/disk-template");
    const svg = await page.getByTestId("disk-template").innerHTML();
    for (const mark of [">N<", ">S<", ">E<", ">W<", "Seeing (1–5)", "Groups g", "Spots s"])
      expect(svg).toContain(mark);
    await screenshot(page, "disk-template");
  });
});
