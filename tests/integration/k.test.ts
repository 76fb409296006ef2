import { eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";

import { GET as getSettings, PUT as putSettings } from "@/app/api/v1/k-settings/route";
import { getDb } from "@/db/client";
import { listKDriftAlerts, listKHistory, listObserverKSummaries, saveKSettings } from "@/db/queries/k";
import { runFullRecompute } from "@/db/queries/recompute";
import { importReferenceSeries } from "@/db/queries/reference-series";
import { kCoefficients, settings } from "@/db/schema";
import { formatDayNumber } from "@/lib/counts/series";
import { DEFAULT_K_SETTINGS, type KSettings } from "@/lib/validation/k-settings";

import { splitRawCount, type SyntheticNetwork } from "../unit/counts/helpers";
import { generateSyntheticNetwork, insertNetwork, makeUnits, type Unit } from "./series-support";
import { apiRequest, makeUser } from "./support";

// Two quarters of 2024 (91 days each) of invented counts from observers with
// known k; every unit counts on about 75% of days, so about 68 common days a
// quarter, comfortably above the 60 the issue asks to be enough for 2%.
const FIRST_DAY_NUMBER = 19_723; // 2024-01-01
const DAY_COUNT = 182;
const SECOND_QUARTER_START = "2024-04-01";
/** obs-005 changes its counting habit in Q2: its k grows by a quarter. */
const DRIFTING = "obs-005";
const DRIFT_FACTOR = 1.25;
/** obs-006 is the second instrument of obs-001's observer, with its own k. */
const SECOND_INSTRUMENT = "obs-006";

let network: SyntheticNetwork;
let units: Map<string, Unit>;
let coordinator: Awaited<ReturnType<typeof makeUser>>;
let sparse: Unit;

const trueK = (id: string, day: string) =>
  (network.trueK.get(id) ?? 0) * (id === DRIFTING && day >= SECOND_QUARTER_START ? DRIFT_FACTOR : 1);

async function storedK({ unit }: { unit: Unit }) {
  return getDb()
    .select()
    .from(kCoefficients)
    .where(eq(kCoefficients.instrumentId, unit.instrumentId))
    .orderBy(kCoefficients.periodStart);
}

async function recomputeWith(overrides: Partial<KSettings>) {
  const chosen = { ...DEFAULT_K_SETTINGS, periodKind: "quarter" as const, ...overrides };
  return runFullRecompute({ settings: chosen });
}

beforeAll(async () => {
  coordinator = await makeUser({ role: "coordinator" });
  network = generateSyntheticNetwork({
    seed: 7,
    observerCount: 8,
    dayCount: DAY_COUNT,
    firstDayNumber: FIRST_DAY_NUMBER,
    coverage: 0.75,
    noise: "poisson",
  });
  // The drifting observer counts fewer spots from Q2 on: raw = A / (k·1.25).
  network.observations = network.observations.map((o) => {
    if (o.observerId !== DRIFTING || formatDayNumber(o.day) < SECOND_QUARTER_START) return o;
    const raw = Math.max(11, Math.round(o.raw / DRIFT_FACTOR));
    return { ...o, raw, ...splitRawCount(raw) };
  });
  units = await makeUnits({
    ids: network.observerIds,
    secondInstruments: { [SECOND_INSTRUMENT]: "obs-001" },
  });
  await insertNetwork({ network, units });

  // An observer with only 15 counts in Q1: below the default minimum of 20 common days.
  const few = generateSyntheticNetwork({
    seed: 99,
    observerCount: 1,
    dayCount: 15,
    firstDayNumber: FIRST_DAY_NUMBER + 10,
    noise: "poisson",
  });
  few.observations = few.observations.map((o) => ({ ...o, observerId: "sparse" }));
  const sparseUnits = await makeUnits({ ids: ["sparse"] });
  sparse = sparseUnits.get("sparse")!;
  await insertNetwork({ network: few, units: sparseUnits });
});

describe("k against the network with a pilot held fixed", () => {
  it("recovers every observer's and instrument's k within 2% per quarter", async () => {
    const pilot = units.get("obs-000")!;
    await recomputeWith({ pilotObserverId: pilot.observerId, pilotK: network.trueK.get("obs-000")! });
    for (const id of network.observerIds) {
      const rows = await storedK({ unit: units.get(id)! });
      expect(
        rows.map((r) => r.periodStart),
        id,
      ).toEqual(["2024-01-01", "2024-04-01"]);
      for (const row of rows) {
        expect(row.commonDays, `${id} ${row.periodStart}`).toBeGreaterThanOrEqual(55);
        expect(Math.abs(row.k / trueK(id, row.periodStart) - 1), `${id} ${row.periodStart}`).toBeLessThan(
          0.02,
        );
        expect(row).toMatchObject({
          periodKind: "quarter",
          method: "ratio-of-sums",
          periodEnd: row.periodStart === "2024-01-01" ? "2024-03-31" : "2024-06-30",
        });
        if (id === "obs-000")
          expect(row).toMatchObject({
            k: network.trueK.get("obs-000"),
            sigma: 0,
            reference: "network:pilot",
          });
        else expect(row.sigma!).toBeGreaterThan(0);
      }
    }
    // One observer, two instruments, two different k.
    const first = (await storedK({ unit: units.get("obs-001")! }))[0]!;
    const second = (await storedK({ unit: units.get(SECOND_INSTRUMENT)! }))[0]!;
    expect(first.observerId).toBe(second.observerId);
    expect(Math.abs(first.k - second.k)).toBeGreaterThan(0.05);
  });

  it("picks the busiest observer as pilot when none is chosen, keeping every ratio of k", async () => {
    await recomputeWith({});
    const all = await getDb().select().from(kCoefficients).where(eq(kCoefficients.periodStart, "2024-01-01"));
    const pilots = all.filter((r) => r.reference === "network:pilot");
    expect(pilots).toHaveLength(1);
    expect(pilots[0]!.k).toBe(1);
    const pilotId = [...units.entries()].find(([, u]) => u.instrumentId === pilots[0]!.instrumentId)![0];
    for (const id of network.observerIds) {
      const row = all.find((r) => r.instrumentId === units.get(id)!.instrumentId)!;
      expect(Math.abs(row.k / (trueK(id, "2024-01-01") / trueK(pilotId, "2024-01-01")) - 1), id).toBeLessThan(
        0.02,
      );
    }
  });

  it("stores no k below the minimum of common days, and one when the minimum allows it", async () => {
    await recomputeWith({});
    expect(await storedK({ unit: sparse })).toHaveLength(0);
    await recomputeWith({ minCommonDays: 10 });
    const rows = await storedK({ unit: sparse });
    expect(rows).toHaveLength(1);
    expect(rows[0]!.commonDays).toBeGreaterThanOrEqual(10);
    expect(rows[0]!.commonDays).toBeLessThan(20);
  });

  it("uses the chosen method and period kind", async () => {
    await recomputeWith({
      method: "median-of-ratios",
      periodKind: "year",
      pilotObserverId: units.get("obs-000")!.observerId,
      pilotK: network.trueK.get("obs-000")!,
    });
    const rows = await storedK({ unit: units.get("obs-002")! });
    expect(rows).toHaveLength(1);
    expect(rows[0]).toMatchObject({
      method: "median-of-ratios",
      periodKind: "year",
      periodStart: "2024-01-01",
      periodEnd: "2024-12-31",
    });
    expect(Math.abs(rows[0]!.k / network.trueK.get("obs-002")! - 1)).toBeLessThan(0.03);
  });
});

describe("k against an imported reference series", () => {
  it("recovers every k within 2% given about 60 common days", async () => {
    const series = await importReferenceSeries({
      input: {
        name: "Invented reference (test)",
        licence: "Test data, no licence needed",
        source: null,
        values: [...network.reference.entries()].map(([day, value]) => ({
          day: formatDayNumber(day),
          value,
        })),
        firstDay: formatDayNumber(FIRST_DAY_NUMBER),
        lastDay: formatDayNumber(FIRST_DAY_NUMBER + DAY_COUNT - 1),
      },
      importedByUserId: coordinator.user.id,
    });
    await recomputeWith({ referenceSeriesId: series.id });
    for (const id of network.observerIds) {
      for (const row of await storedK({ unit: units.get(id)! })) {
        expect(row.reference).toBe(`series:${series.id}`);
        expect(Math.abs(row.k / trueK(id, row.periodStart) - 1), `${id} ${row.periodStart}`).toBeLessThan(
          0.02,
        );
      }
    }
    const history = await listKHistory({ observerId: units.get("obs-003")!.observerId });
    expect(history[0]!.referenceLabel).toBe("Invented reference (test)");
  });
});

describe("drift alerts", () => {
  it("flag the observer whose k moved more than the set fraction, and no one else", async () => {
    await recomputeWith({
      pilotObserverId: units.get("obs-000")!.observerId,
      pilotK: network.trueK.get("obs-000")!,
    });
    const alerts = await listKDriftAlerts({ maxFraction: 0.1 });
    expect(alerts).toHaveLength(1);
    expect(alerts[0]).toMatchObject({
      observerId: units.get(DRIFTING)!.observerId,
      previous: { periodStart: "2024-01-01" },
      current: { periodStart: "2024-04-01" },
    });
    expect(alerts[0]!.relativeChange).toBeCloseTo(DRIFT_FACTOR - 1, 1);
    expect(alerts[0]!.zScore!).toBeGreaterThan(5);
    // A threshold above the move silences it.
    expect(await listKDriftAlerts({ maxFraction: 0.3 })).toHaveLength(0);

    const summaries = await listObserverKSummaries();
    const drifting = summaries.find((s) => s.instrumentId === units.get(DRIFTING)!.instrumentId)!;
    expect(drifting).toMatchObject({ periods: 2, latest: { periodStart: "2024-04-01" } });
    expect(drifting.acceptedCounts).toBeGreaterThan(100);
  });
});

describe("GET/PUT /api/v1/k-settings", () => {
  const put = async (body: unknown, userId?: string) =>
    putSettings(await apiRequest("/api/v1/k-settings", { method: "PUT", body, userId }));
  const valid = {
    periodKind: "quarter",
    method: "mean-of-ratios",
    minCommonDays: "25",
    referenceSeriesId: "network",
    pilotObserverId: "",
    pilotK: "1",
    driftFraction: "0.15",
  };

  it("is for coordinators and admins only", async () => {
    expect((await put(valid)).status).toBe(401);
    expect((await put(valid, units.get("obs-000")!.userId)).status).toBe(403);
    expect(
      (await getSettings(await apiRequest("/api/v1/k-settings", { userId: units.get("obs-000")!.userId })))
        .status,
    ).toBe(403);
  });

  it("saves valid settings and refuses bad ones field by field", async () => {
    const res = await put(valid, coordinator.user.id);
    expect(res.status).toBe(200);
    expect(await res.json()).toMatchObject({
      periodKind: "quarter",
      method: "mean-of-ratios",
      minCommonDays: 25,
      pilotObserverId: null,
      driftFraction: 0.15,
    });

    const bad = await put(
      { ...valid, minCommonDays: "1", method: "guess", driftFraction: "lots" },
      coordinator.user.id,
    );
    expect(bad.status).toBe(400);
    const issues = (await bad.json()).error.issues.map((i: { path: string }) => i.path).sort();
    expect(issues).toEqual(["driftFraction", "method", "minCommonDays"]);

    const unknown = await put(
      { ...valid, pilotObserverId: "nobody", referenceSeriesId: "missing" },
      coordinator.user.id,
    );
    expect(unknown.status).toBe(400);
    expect((await unknown.json()).error.issues.map((i: { path: string }) => i.path).sort()).toEqual([
      "pilotObserverId",
      "referenceSeriesId",
    ]);
    // The refused request changed nothing.
    const stored = await getDb().select().from(settings).where(eq(settings.key, "k.minCommonDays"));
    expect(stored[0]!.value).toBe(25);
  });

  it("round-trips through saveKSettings", async () => {
    await saveKSettings({ input: { ...DEFAULT_K_SETTINGS, pilotObserverId: null } });
    const res = await getSettings(await apiRequest("/api/v1/k-settings", { userId: coordinator.user.id }));
    expect(await res.json()).toEqual(DEFAULT_K_SETTINGS);
  });
});
