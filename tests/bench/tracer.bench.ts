/**
 * Speed of the Disk tracer: `npm run bench -- tracer`.
 *
 * Part 1 (Node): the tracer's own geometry for one instant — converting
 * traced spots to heliographic positions, computing the grid and placing it
 * on the drawing, measuring a 500-spot tracing, suggesting groups. The raw
 * diskToHeliographic rate is measured by tests/bench/solar.bench.ts and is
 * not repeated here.
 *
 * Part 2 (headless Chromium): a tracing with 500 spots and the grid on is
 * opened in the tracer, one spot is dragged across the disk, and the work
 * per frame (pointer handling + Konva redraw) and the frame interval are
 * recorded; the grid and spot layers' draw times are timed on their own.
 *
 * Where the app runs:
 * - BENCH_BASE_URL=http://localhost:3000 uses a server that is already up
 *   (a dev server gives pessimistic figures: React's development build and
 *   unminified code are several times slower than production);
 * - otherwise the built app is started the way tests/e2e/global-setup.ts
 *   does, on a free port with a temporary database, after building it if
 *   .next/BUILD_ID is missing or older than the sources.
 * BENCH_SKIP_BROWSER=1 runs part 1 only.
 *
 * Against a running server the bench signs in as the demo observer and keeps
 * one observation dated 2000-01-01 ("Benchmark tracing") for its tracing,
 * reusing it on later runs.
 */
import { mkdtempSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { performance } from "node:perf_hooks";

import { chromium, type Page } from "playwright-core";

import { solarOrientation, type SolarOrientation } from "../../lib/solar/ephemeris";
import { computeHeliographicGrid } from "../../lib/solar/grid";
import { diskToHeliographic, heliographicToDisk } from "../../lib/solar/heliographic";
import { placeGridOnTracing } from "../../lib/tracer/grid-placement";
import { suggestGroups } from "../../lib/tracer/grouping";
import { measureTracing } from "../../lib/tracer/measure";
import { documentToSky, resolveSkyFrame, skyToDocument, type SkyFrame } from "../../lib/tracer/orientation";
import { checkTracingDocument, createEmptyTracing, type TracingDocument } from "../../lib/validation/tracing";
import { buildIfStale, startBuiltApp } from "../support/start-app";

const BENCH_INSTANT = new Date("2000-01-01T12:00:00Z");
const BENCH_NOTE = "Benchmark tracing (made by tests/bench/tracer.bench.ts; safe to delete)";
const SPOT_COUNT = 500;
const GROUP_COUNT = 50;
const DRAG_STEPS = 150;
const DEMO_EMAIL = "observer@example.test";
const DEMO_PASSWORD = "heliotally-demo";

// ---------------------------------------------------------------- helpers

function measureMs(work: () => void, { minRuns = 5, budgetMs = 1_500 } = {}): number {
  work(); // warm-up
  let runs = 0;
  const start = performance.now();
  while (runs < minRuns || performance.now() - start < budgetMs) {
    work();
    runs += 1;
  }
  return (performance.now() - start) / runs;
}

function percentile(values: number[], p: number): number {
  if (values.length === 0) return NaN;
  const sorted = [...values].sort((a, b) => a - b);
  return sorted[Math.min(sorted.length - 1, Math.floor((p / 100) * sorted.length))]!;
}

/** A small deterministic generator, so every run traces the same disk. */
function makeRandom(seed: number) {
  let state = seed >>> 0;
  return () => {
    state = (state * 1664525 + 1013904223) >>> 0;
    return state / 2 ** 32;
  };
}

/** 500 spots in 50 groups of 10, scattered like an active Sun in the two activity belts. */
function makeBenchTracing(sun: SolarOrientation): TracingDocument {
  const random = makeRandom(20000101);
  const document: TracingDocument = {
    ...createEmptyTracing(),
    disk: { cx: 500, cy: 500, r: 420, method: "drag", limbPoints: [] },
    orientation: { mode: "north", point: { x: 500, y: 40 }, mirrored: false },
  };
  const result = resolveSkyFrame({ disk: document.disk, orientation: document.orientation });
  if (!result.ok) throw new Error(result.message);
  const frame = result.frame;
  for (let g = 0; g < GROUP_COUNT; g += 1) {
    const groupId = `g${g}`;
    document.groups.push({ id: groupId, number: g + 1, zurichClass: null, mcintoshClass: null, area: null });
    const lat = (g % 2 === 0 ? 1 : -1) * (8 + random() * 22);
    const lon = -65 + random() * 130;
    for (let s = 0; s < SPOT_COUNT / GROUP_COUNT; s += 1) {
      const onSky = heliographicToDisk(
        { lat: lat + (random() - 0.5) * 3, lon: lon + (random() - 0.5) * 6 },
        sun,
      );
      if (!onSky) throw new Error("bench spot not visible");
      const p = skyToDocument({ point: onSky, frame });
      document.spots.push({
        id: `s${g}-${s}`,
        x: p.x,
        y: p.y,
        umbraRadius: 2 + random() * 3,
        penumbraRadius: s === 0 ? 9 : null,
        groupId,
        area: null,
      });
    }
  }
  return document;
}

// ---------------------------------------------------------------- part 1: Node

function runNodePart(sun: SolarOrientation, document: TracingDocument) {
  const frame = (
    resolveSkyFrame({ disk: document.disk, orientation: document.orientation }) as {
      ok: true;
      frame: SkyFrame;
    }
  ).frame;
  let sink = 0;

  const conversionsPerSecond = (() => {
    const points = document.spots;
    let calls = 0;
    const ms = measureMs(() => {
      for (const spot of points) {
        sink += diskToHeliographic(documentToSky({ point: spot, frame }), sun)?.lat ?? 0;
        calls += 1;
      }
    });
    void calls;
    return (points.length / ms) * 1000;
  })();
  console.log(
    `tracer spot → heliographic (documentToSky + diskToHeliographic): ${Math.round(conversionsPerSecond).toLocaleString("en-US")} spots/s` +
      " (raw diskToHeliographic: see solar.bench.ts)",
  );

  const gridMs = measureMs(() => {
    sink += computeHeliographicGrid({ at: sun }).parallels.length;
  });
  const grid = computeHeliographicGrid({ at: sun });
  const placeMs = measureMs(() => {
    sink += placeGridOnTracing({ grid, frame }).lines.length;
  });
  console.log(
    `grid for one instant: compute ${gridMs.toFixed(2)} ms + place on the drawing ${placeMs.toFixed(2)} ms`,
  );

  const measureTracingMs = measureMs(() => {
    sink += measureTracing({ document, orientation: sun }).counts.spots;
  });
  console.log(
    `measureTracing, ${SPOT_COUNT} spots / ${GROUP_COUNT} groups: ${measureTracingMs.toFixed(2)} ms`,
  );

  const checkMs = measureMs(() => {
    sink += checkTracingDocument(document).ok ? 1 : 0;
  });
  console.log(`checkTracingDocument (size + schema), ${SPOT_COUNT} spots: ${checkMs.toFixed(2)} ms`);

  const placed = measureTracing({ document, orientation: sun }).spots.flatMap((s) =>
    s.position ? [{ id: s.id, lat: s.position.lat, lon: s.position.lon }] : [],
  );
  const suggestMs = measureMs(() => {
    sink += suggestGroups({ spots: placed }).length;
  });
  console.log(`suggestGroups, ${placed.length} spots: ${suggestMs.toFixed(2)} ms`);

  if (!Number.isFinite(sink)) throw new Error("non-finite checksum");
  return {
    spotConversionsPerSecond: Math.round(conversionsPerSecond),
    gridComputeMs: Number(gridMs.toFixed(3)),
    gridPlaceMs: Number(placeMs.toFixed(3)),
    measureTracing500Ms: Number(measureTracingMs.toFixed(3)),
    checkTracing500Ms: Number(checkMs.toFixed(3)),
    suggestGroups500Ms: Number(suggestMs.toFixed(3)),
  };
}

// ---------------------------------------------------------------- part 2: Chromium

/** Builds if needed, then starts the app as the e2e tests do (tests/support/start-app.ts). */
async function buildAndStartApp(): Promise<{ baseUrl: string; stop: () => Promise<void> }> {
  if (
    !buildIfStale({ why: "for the browser benchmark (set BENCH_BASE_URL to use a running server instead)" })
  )
    throw new Error("next build failed");
  return startBuiltApp({ label: "bench", nextAuthSecret: "bench-secret-bench-secret-bench-secret" });
}

/** Finds (or makes, once) the bench observation and stores the 500-spot tracing on it. */
async function prepareTracing(page: Page, baseUrl: string, document: TracingDocument): Promise<string> {
  const day = BENCH_INSTANT.toISOString().slice(0, 10);
  const list = await (
    await page.request.get(`${baseUrl}/api/v1/observations?from=${day}&to=${day}&pageSize=50`)
  ).json();
  let id: string | undefined = list.data?.find((o: { notes: string | null }) => o.notes === BENCH_NOTE)?.id;
  if (!id) {
    const any = await (await page.request.get(`${baseUrl}/api/v1/observations?pageSize=1`)).json();
    const instrumentId = any.data?.[0]?.instrumentId;
    if (!instrumentId) throw new Error("The demo observer has no observation to take an instrument from.");
    const created = await page.request.post(`${baseUrl}/api/v1/observations`, {
      data: {
        observedAt: BENCH_INSTANT.toISOString(),
        seeing: 3,
        instrumentId,
        groups: 0,
        spots: 0,
        notes: BENCH_NOTE,
      },
    });
    if (created.status() !== 201)
      throw new Error(`Could not create the bench observation: ${await created.text()}`);
    id = (await created.json()).id as string;
  }
  const current = await page.request.get(`${baseUrl}/api/v1/observations/${id}/tracing`);
  const baseRevision = current.status() === 200 ? (await current.json()).revision : 0;
  const saved = await page.request.put(`${baseUrl}/api/v1/observations/${id}/tracing`, {
    data: { document, baseRevision },
  });
  if (saved.status() !== 200) throw new Error(`Could not save the bench tracing: ${await saved.text()}`);
  return id;
}

type BrowserFigures = {
  mode: string;
  frames: number;
  workPerFrameMs: { p50: number; p95: number; max: number };
  frameIntervalMs: { p50: number; p95: number };
  gridLayerDrawMs: number;
  spotsLayerDrawMs: number;
};

async function runBrowserPart(
  baseUrl: string,
  document: TracingDocument,
  mode: string,
): Promise<BrowserFigures> {
  const context = await chromium.launchPersistentContext(
    mkdtempSync(path.join(tmpdir(), "heliotally-bench-chromium-")),
    {
      executablePath: process.env.CHROMIUM_PATH ?? "/usr/bin/chromium",
      headless: true,
      viewport: { width: 1280, height: 1000 },
      args: [
        "--no-sandbox",
        "--disable-gpu",
        "--disable-quic",
        "--no-first-run",
        "--disable-background-networking",
        "--disable-component-update",
        "--disable-sync",
      ],
    },
  );
  try {
    const page = context.pages()[0] ?? (await context.newPage());
    page.setDefaultTimeout(120_000);
    // tsx compiles the functions below with esbuild's keepNames, which calls a __name helper the page lacks.
    await page.addInitScript({ content: "window.__name = (fn) => fn;" });
    await page.goto(`${baseUrl}/sign-in`);
    await page.fill("#email", DEMO_EMAIL);
    await page.fill("#password", DEMO_PASSWORD);
    await page.getByRole("button", { name: "Sign in", exact: true }).click();
    await page.waitForURL((url) => !url.pathname.startsWith("/sign-in"));

    const id = await prepareTracing(page, baseUrl, document);
    await page.goto(`${baseUrl}/logbook/${id}/trace`);
    await page.getByText(`${SPOT_COUNT} placed`).waitFor();
    const stage = page.getByTestId("tracer-stage");
    await stage.scrollIntoViewIfNeeded();
    await page.keyboard.press("v");
    await page.waitForTimeout(500);

    // Instrument the page: time every pointer event's handling and every layer redraw, bucketed per animation frame.
    const target = document.spots[0]!;
    const start = await page.evaluate(
      ({ x, y }) => {
        type KonvaLike = {
          stages: Array<{
            getAbsoluteTransform(): { point(p: { x: number; y: number }): { x: number; y: number } };
            container(): HTMLElement;
            getLayers(): Array<{ draw(): void }>;
          }>;
          Layer: { prototype: { drawScene: (...args: unknown[]) => unknown } };
        };
        const w = window as unknown as {
          Konva: KonvaLike;
          __bench: { work: number[]; intervals: number[]; run: boolean };
        };
        const konva = w.Konva;
        const stage = konva.stages[0]!;
        const bench = (w.__bench = { work: [] as number[], intervals: [] as number[], run: true });
        let pending = 0;
        let eventStart = 0;
        window.addEventListener("pointermove", () => (eventStart = performance.now()), { capture: true });
        window.addEventListener("pointermove", () => (pending += performance.now() - eventStart));
        const drawScene = konva.Layer.prototype.drawScene;
        konva.Layer.prototype.drawScene = function (this: unknown, ...args: unknown[]) {
          const t0 = performance.now();
          const out = drawScene.apply(this, args);
          pending += performance.now() - t0;
          return out;
        };
        let last = performance.now();
        const tick = (now: number) => {
          bench.intervals.push(now - last);
          bench.work.push(pending);
          pending = 0;
          last = now;
          if (bench.run) requestAnimationFrame(tick);
        };
        requestAnimationFrame(tick);
        const rect = stage.container().getBoundingClientRect();
        const p = stage.getAbsoluteTransform().point({ x, y });
        return { x: rect.left + p.x, y: rect.top + p.y };
      },
      { x: target.x, y: target.y },
    );

    await page.mouse.move(start.x, start.y);
    await page.mouse.down();
    await page.evaluate(() => {
      const w = window as unknown as { __bench: { work: number[]; intervals: number[] } };
      w.__bench.work.length = 0;
      w.__bench.intervals.length = 0;
    });
    for (let i = 1; i <= DRAG_STEPS; i += 1) {
      const t = i / DRAG_STEPS;
      await page.mouse.move(start.x + 120 * Math.sin(t * Math.PI * 2), start.y + 160 * t);
    }
    const samples = await page.evaluate(() => {
      const w = window as unknown as { __bench: { work: number[]; intervals: number[]; run: boolean } };
      w.__bench.run = false;
      return { work: [...w.__bench.work], intervals: [...w.__bench.intervals] };
    });
    await page.mouse.up();

    const layerTimes = await page.evaluate(() => {
      const w = window as unknown as { Konva: { stages: Array<{ getLayers(): Array<{ draw(): void }> }> } };
      const layers = w.Konva.stages[0]!.getLayers();
      const time = (index: number) => {
        const layer = layers[index]!;
        layer.draw();
        const t0 = performance.now();
        for (let i = 0; i < 20; i += 1) layer.draw();
        return (performance.now() - t0) / 20;
      };
      // Layer order in components/tracer/disk-tracer.tsx: background, disk + grid, spots, overlay.
      return { grid: time(1), spots: time(2) };
    });

    // Frames with no input carry no work; keep the frames the drag actually touched.
    const busy = samples.work.filter((ms) => ms > 0);
    return {
      mode,
      frames: busy.length,
      workPerFrameMs: {
        p50: Number(percentile(busy, 50).toFixed(2)),
        p95: Number(percentile(busy, 95).toFixed(2)),
        max: Number(Math.max(...busy).toFixed(2)),
      },
      frameIntervalMs: {
        p50: Number(percentile(samples.intervals, 50).toFixed(2)),
        p95: Number(percentile(samples.intervals, 95).toFixed(2)),
      },
      gridLayerDrawMs: Number(layerTimes.grid.toFixed(2)),
      spotsLayerDrawMs: Number(layerTimes.spots.toFixed(2)),
    };
  } finally {
    await context.close();
  }
}

// ---------------------------------------------------------------- main

async function main(): Promise<void> {
  const sun = solarOrientation(BENCH_INSTANT);
  const document = makeBenchTracing(sun);
  const node = runNodePart(sun, document);

  let browser: BrowserFigures | null = null;
  if (process.env.BENCH_SKIP_BROWSER !== "1") {
    const given = process.env.BENCH_BASE_URL;
    const app = given
      ? { baseUrl: given.replace(/\/$/, ""), stop: async () => {} }
      : await buildAndStartApp();
    try {
      const mode = given ? `running server at ${given} (a dev server is pessimistic)` : "production build";
      browser = await runBrowserPart(app.baseUrl, document, mode);
      console.log(`Chromium (${browser.mode}), dragging 1 of ${SPOT_COUNT} spots with the grid on:`);
      console.log(
        `  work per frame (pointer handling + redraw): p50 ${browser.workPerFrameMs.p50} ms, p95 ${browser.workPerFrameMs.p95} ms, max ${browser.workPerFrameMs.max} ms over ${browser.frames} frames (aim < 16 ms)`,
      );
      console.log(
        `  frame interval: p50 ${browser.frameIntervalMs.p50} ms, p95 ${browser.frameIntervalMs.p95} ms`,
      );
      console.log(
        `  one redraw: grid layer ${browser.gridLayerDrawMs} ms, spots layer (${SPOT_COUNT} spots) ${browser.spotsLayerDrawMs} ms`,
      );
    } finally {
      await app.stop();
    }
  }

  console.log(JSON.stringify({ bench: "tracer", node: process.version, ...node, browser }));
}

main().catch((error) => {
  console.error(error);
  process.exit(1);
});
