import { eq, inArray, sql } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";

import { GET as getJob } from "@/app/api/v1/jobs/[id]/route";
import { GET as getChart } from "@/app/api/v1/series/chart/route";
import { GET as getLatitudes } from "@/app/api/v1/series/latitudes/route";
import { GET as getObserverChart } from "@/app/api/v1/series/observer/route";
import { POST as postRecompute } from "@/app/api/v1/series/recompute/route";
import { GET as getSeries } from "@/app/api/v1/series/[kind]/route";
import { getDb } from "@/db/client";
import { runFullRecompute, runRecomputeJob, waitForRecompute } from "@/db/queries/recompute";
import { refreshSeriesForDays } from "@/db/queries/series";
import { getMonthReport } from "@/db/queries/series-read";
import {
  kCoefficients,
  observationGroups,
  observations,
  seriesDaily,
  seriesMonthly,
  seriesYearly,
} from "@/db/schema";
import {
  computeDailyIndex,
  computeMonthlyMeans,
  smoothed13,
  toDenseMonthlySeries,
} from "@/lib/counts/series";

import { generateSyntheticNetwork, insertNetwork, makeUnits, type Unit } from "./series-support";
import { apiRequest, makeUser } from "./support";

type Made = Awaited<ReturnType<typeof makeUser>>;
let coordinator: Made;
let admin: Made;
let educator: Made;
let units: Map<string, Unit>;

// 15 months of invented counts (2024-01-01 on): enough for 13-month smoothed values.
const FIRST_DAY_NUMBER = 19_723;
const DAY_COUNT = 456;

async function snapshot() {
  const db = getDb();
  const daily = await db.select().from(seriesDaily).orderBy(seriesDaily.hemisphere, seriesDaily.day);
  const monthly = await db
    .select()
    .from(seriesMonthly)
    .orderBy(seriesMonthly.hemisphere, seriesMonthly.month);
  const yearly = await db.select().from(seriesYearly).orderBy(seriesYearly.hemisphere, seriesYearly.year);
  // updatedAt differs between writes of the same values; compare the values.
  const strip = <T extends { updatedAt: Date }>(rows: T[]) =>
    rows.map((row) => {
      const copy: Partial<T> = { ...row };
      delete copy.updatedAt;
      return copy as Omit<T, "updatedAt">;
    });
  return { daily: strip(daily), monthly: strip(monthly), yearly: strip(yearly) };
}

/** Same rows, numbers equal to 1e-9 relative (sums may be added in another order). */
function expectSameSeries(
  actual: Awaited<ReturnType<typeof snapshot>>,
  expected: Awaited<ReturnType<typeof snapshot>>,
) {
  for (const key of ["daily", "monthly", "yearly"] as const) {
    expect(actual[key].length, key).toBe(expected[key].length);
    actual[key].forEach((row, i) => {
      const other = expected[key][i] as Record<string, unknown>;
      for (const [column, value] of Object.entries(row)) {
        const want = other[column];
        if (typeof value === "number" && typeof want === "number") {
          expect(Math.abs(value - want), `${key}[${i}].${column}`).toBeLessThanOrEqual(
            1e-9 * Math.max(1, Math.abs(want)),
          );
        } else {
          expect(value, `${key}[${i}].${column}`).toEqual(want);
        }
      }
    });
  }
}

beforeAll(async () => {
  coordinator = await makeUser({ role: "coordinator" });
  admin = await makeUser({ role: "admin" });
  educator = await makeUser({ role: "educator" });
  const network = generateSyntheticNetwork({
    seed: 31,
    observerCount: 5,
    dayCount: DAY_COUNT,
    firstDayNumber: FIRST_DAY_NUMBER,
    coverage: 0.7,
    noise: "poisson",
    activityMinimum: 30,
    activityMaximum: 160,
  });
  // obs-004 is the second instrument of obs-000's observer.
  units = await makeUnits({ ids: network.observerIds, secondInstruments: { "obs-004": "obs-000" } });
  await insertNetwork({ network, units, splitIds: new Set(["obs-001", "obs-002"]) });
  await runFullRecompute();
});

describe("full recompute", () => {
  it("stores every series from accepted counts, matching the counts domain functions", async () => {
    const { daily, monthly } = await snapshot();
    const db = getDb();
    const rows = await db.select().from(observations).where(eq(observations.status, "accepted"));
    const ks = await db.select().from(kCoefficients);
    const kOf = (o: (typeof rows)[number]) =>
      ks.find(
        (k) => k.instrumentId === o.instrumentId && k.periodStart <= o.utDate && k.periodEnd >= o.utDate,
      )?.k ?? 1;
    // One observer sends two instruments' counts on some days; the stored
    // series averages them per observer first, so compare on other days.
    const perObserverDay = new Map<string, number>();
    for (const o of rows)
      perObserverDay.set(
        `${o.observerId}|${o.utDate}`,
        (perObserverDay.get(`${o.observerId}|${o.utDate}`) ?? 0) + 1,
      );
    const cleanDays = new Set(
      rows
        .map((o) => o.utDate)
        .filter((d) => rows.every((o) => o.utDate !== d || perObserverDay.get(`${o.observerId}|${d}`) === 1)),
    );
    const expected = computeDailyIndex(
      rows.filter((o) => cleanDays.has(o.utDate)).map((o) => ({ ...o, day: o.utDate, k: kOf(o) })),
    );
    expect(expected.length).toBeGreaterThan(100);
    for (const entry of expected) {
      const stored = daily.find((d) => d.hemisphere === "all" && d.day === entry.day)!;
      expect(stored.mean).toBeCloseTo(entry.relativeNumber, 9);
      expect(stored.observers).toBe(entry.count);
      if (entry.sd === null) expect(stored.sd).toBeNull();
      else expect(stored.sd).toBeCloseTo(entry.sd, 9);
      const north = daily.find((d) => d.hemisphere === "N" && d.day === entry.day);
      expect(north?.mean ?? null).toEqual(entry.north ? expect.closeTo(entry.north.relativeNumber, 9) : null);
    }

    // Monthly means and the 13-month smoothing, against lib/counts on the stored daily values.
    const dailyAll = daily
      .filter((d) => d.hemisphere === "all")
      .map((d) => ({
        relativeNumber: d.mean,
        count: d.observers,
        sd: d.sd,
        day: d.day,
        dayNumber: 0,
        north: null,
        south: null,
      }));
    const months = computeMonthlyMeans(
      dailyAll.map((d) => ({ ...d, dayNumber: Math.round(Date.parse(`${d.day}T00:00:00Z`) / 86_400_000) })),
    );
    const dense = toDenseMonthlySeries({ monthly: months });
    const smoothed = smoothed13(dense.values);
    const storedAll = monthly.filter((m) => m.hemisphere === "all");
    expect(storedAll).toHaveLength(15);
    storedAll.forEach((m, i) => {
      expect(m.mean).toBeCloseTo(months[i]!.relativeNumber, 9);
      expect(m.days).toBe(months[i]!.count);
      if (smoothed[i] === null) expect(m.smoothed).toBeNull();
      else expect(m.smoothed).toBeCloseTo(smoothed[i]!, 9);
    });
    // 15 months give exactly three smoothed values (months 7–9): the first and last six have none.
    expect(storedAll.filter((m) => m.smoothed !== null).map((m) => m.month)).toEqual([
      "2024-07",
      "2024-08",
      "2024-09",
    ]);
  });

  it("agrees with the incremental rule: refreshing every day changes nothing", async () => {
    const before = await snapshot();
    const days = [...new Set(before.daily.map((d) => d.day))];
    await refreshSeriesForDays({ days });
    expectSameSeries(await snapshot(), before);
  });
});

describe("refreshSeriesForDays", () => {
  it("after accepts and rejects, matches a full rebuild from the same k", async () => {
    const db = getDb();
    const all = await db.select().from(observations).orderBy(observations.utDate);
    const inJune = all.filter((o) => o.utDate.startsWith("2024-06"));
    const toReject = inJune.slice(0, 6);
    // Every count of one day rejected: the day must disappear.
    const emptiedDay = "2024-09-10";
    const emptied = all.filter((o) => o.utDate === emptiedDay);
    await db
      .update(observations)
      .set({ status: "rejected" })
      .where(
        inArray(
          observations.id,
          [...toReject, ...emptied].map((o) => o.id),
        ),
      );
    // A submitted count accepted later, on a day no one else counted.
    const newcomer = units.get("obs-003")!;
    await db.insert(observations).values({
      observerId: newcomer.observerId,
      instrumentId: newcomer.instrumentId,
      observedAt: new Date("2025-04-02T09:00:00Z"),
      utDate: "2025-04-02",
      seeing: 2,
      groups: 4,
      spots: 30,
      status: "accepted",
    });
    const days = [...new Set([...toReject.map((o) => o.utDate), emptiedDay, "2025-04-02"])];
    await refreshSeriesForDays({ days });
    const incremental = await snapshot();
    expect(incremental.daily.some((d) => d.day === emptiedDay)).toBe(false);
    expect(incremental.daily.find((d) => d.day === "2025-04-02" && d.hemisphere === "all")?.observers).toBe(
      1,
    );
    // A new month appeared: 2025-04.
    expect(incremental.monthly.some((m) => m.month === "2025-04" && m.hemisphere === "all")).toBe(true);

    await runFullRecompute({ refitK: false });
    expectSameSeries(incremental, await snapshot());
  });

  it("ignores days that are not calendar days and an empty list", async () => {
    const before = await snapshot();
    await refreshSeriesForDays({ days: [] });
    await refreshSeriesForDays({ days: ["2024-02-30", "not a day"] });
    expectSameSeries(await snapshot(), before);
  });
});

describe("GET /api/v1/series/[kind]", () => {
  const call = async (path: string, userId?: string) => {
    const url = new URL(path, "http://localhost:3999");
    const kind = url.pathname.split("/").pop()!;
    return getSeries(await apiRequest(path, { userId }), { params: Promise.resolve({ kind }) });
  };

  it("answers 401 signed out and lets every signed-in role read", async () => {
    expect((await call("/api/v1/series/daily")).status).toBe(401);
    const observer = [...units.values()][0]!;
    for (const userId of [observer.userId, educator.user.id, coordinator.user.id, admin.user.id]) {
      expect((await call("/api/v1/series/daily", userId)).status).toBe(200);
    }
  });

  it("pages and sorts on the server", async () => {
    const userId = coordinator.user.id;
    const first = await (await call("/api/v1/series/daily?pageSize=50&sort=mean:desc", userId)).json();
    expect(first.data).toHaveLength(50);
    const means = first.data.map((r: { mean: number }) => r.mean);
    expect(means).toEqual([...means].sort((a, b) => b - a));
    const second = await (
      await call("/api/v1/series/daily?pageSize=50&page=2&sort=mean:desc", userId)
    ).json();
    expect(second.data[0].mean).toBeLessThanOrEqual(means[49]);
    const [counted] = await getDb()
      .select({ n: sql<number>`count(*)` })
      .from(seriesDaily)
      .where(eq(seriesDaily.hemisphere, "all"));
    expect(first.total).toBe(counted!.n);

    const filtered = await (
      await call("/api/v1/series/daily?from=2024-03-01&to=2024-03-31&sort=day:asc", userId)
    ).json();
    expect(filtered.data.every((r: { day: string }) => r.day >= "2024-03-01" && r.day <= "2024-03-31")).toBe(
      true,
    );
    expect(filtered.data.map((r: { day: string }) => r.day)).toEqual(
      [...filtered.data.map((r: { day: string }) => r.day)].sort(),
    );

    const north = await (await call("/api/v1/series/monthly?hemisphere=N&sort=smoothed:desc", userId)).json();
    expect(north.hemisphere).toBe("N");
    expect(north.data.length).toBeGreaterThan(0);
    // Months without a smoothed value sort last in either direction.
    const smoothed = north.data.map((r: { smoothed: number | null }) => r.smoothed);
    expect(smoothed.indexOf(null)).toBeGreaterThan(
      smoothed.lastIndexOf(smoothed.find((v: number | null) => v !== null)),
    );

    const yearly = await (await call("/api/v1/series/yearly?from=2024&to=2024", userId)).json();
    expect(yearly.data.map((r: { year: number }) => r.year)).toEqual([2024]);
  });

  it("refuses bad query strings with the field named", async () => {
    const res = await call("/api/v1/series/daily?sort=spots:desc&hemisphere=E", coordinator.user.id);
    expect(res.status).toBe(400);
    const body = await res.json();
    expect(body.error.issues.map((i: { path: string }) => i.path).sort()).toEqual(["hemisphere", "sort"]);
    expect((await call("/api/v1/series/weekly", coordinator.user.id)).status).toBe(404);
    expect((await call("/api/v1/series/monthly?from=2024-13", coordinator.user.id)).status).toBe(400);
  });

  it("exports CSV by path or by format", async () => {
    const byPath = await call("/api/v1/series/monthly.csv?hemisphere=all", coordinator.user.id);
    expect(byPath.headers.get("content-type")).toContain("text/csv");
    expect(byPath.headers.get("content-disposition")).toContain("heliotally-monthly-all.csv");
    const lines = (await byPath.text()).trim().split("\n");
    expect(lines[0]).toBe("month,hemisphere,days,relative_number,smoothed_13_month");
    const months = await getDb()
      .select()
      .from(seriesMonthly)
      .where(eq(seriesMonthly.hemisphere, "all"))
      .orderBy(seriesMonthly.month);
    expect(lines).toHaveLength(months.length + 1);
    expect(lines[1]).toBe(`${months[0]!.month},all,${months[0]!.days},${months[0]!.mean.toFixed(3)},`);

    const byFormat = await call(
      "/api/v1/series/daily?format=csv&from=2024-02-01&to=2024-02-29&hemisphere=S",
      observerUserId(),
    );
    const csv = (await byFormat.text()).trim().split("\n");
    expect(csv[0]).toBe("day,hemisphere,observers,relative_number,sd");
    expect(csv.slice(1).every((line) => /^2024-02-\d\d,S,\d+,\d+\.\d{3},(\d+\.\d{3})?$/.test(line))).toBe(
      true,
    );
  });
});

function observerUserId() {
  return [...units.values()][1]!.userId;
}

describe("chart and observer data", () => {
  it("gives every role the chart series and an observer only their own comparison", async () => {
    const chart = await (
      await getChart(await apiRequest("/api/v1/series/chart", { userId: observerUserId() }))
    ).json();
    expect(chart.daily.days.length).toBe(chart.daily.all.length);
    expect(chart.monthly.months.length).toBe(15 + 1);

    const own = [...units.values()][1]!;
    const other = [...units.values()][2]!;
    const mine = await getObserverChart(await apiRequest("/api/v1/series/observer", { userId: own.userId }));
    expect(mine.status).toBe(200);
    const body = await mine.json();
    expect(body.observer.id).toBe(own.observerId);
    expect(body.points.days.length).toBeGreaterThan(100);
    expect(body.k.length).toBeGreaterThan(0);
    const refused = await getObserverChart(
      await apiRequest(`/api/v1/series/observer?observerId=${other.observerId}`, { userId: own.userId }),
    );
    expect(refused.status).toBe(404);
    const asCoordinator = await getObserverChart(
      await apiRequest(`/api/v1/series/observer?observerId=${other.observerId}`, {
        userId: coordinator.user.id,
      }),
    );
    expect((await asCoordinator.json()).observer.id).toBe(other.observerId);
  });

  it("gives the latitude–time diagram the groups of accepted counts only", async () => {
    const signedOut = await getLatitudes(await apiRequest("/api/v1/series/latitudes"));
    expect(signedOut.status).toBe(401);
    const ask = async () =>
      (await getLatitudes(await apiRequest("/api/v1/series/latitudes", { userId: educator.user.id }))).json();
    expect(await ask()).toEqual({ days: [], latitudes: [], hemispheres: [] });

    const db = getDb();
    const [accepted] = await db
      .select()
      .from(observations)
      .where(eq(observations.status, "accepted"))
      .limit(1);
    const [rejected] = await db
      .select()
      .from(observations)
      .where(eq(observations.status, "rejected"))
      .limit(1);
    const group = { number: 1, spots: 3, cmdDeg: 10, carringtonLonDeg: 200 };
    await db.insert(observationGroups).values([
      { ...group, observationId: accepted!.id, latitudeDeg: 14.5, hemisphere: "N" },
      { ...group, number: 2, observationId: accepted!.id, latitudeDeg: -21, hemisphere: "S" },
      { ...group, observationId: rejected!.id, latitudeDeg: 30, hemisphere: "N" },
    ]);
    const answer = await ask();
    expect(answer.days).toEqual([accepted!.utDate, accepted!.utDate]);
    expect([...answer.latitudes].sort()).toEqual([-21, 14.5]);
    expect(answer.hemispheres.sort()).toEqual(["N", "S"]);
  });

  it("builds the monthly report", async () => {
    const report = await getMonthReport({ month: "2024-03" });
    expect(report!.days.length).toBeGreaterThan(20);
    expect(report!.means.all!.days).toBe(report!.days.filter((d) => d.all).length);
    expect(report!.observers.length).toBe(5);
    expect(await getMonthReport({ month: "2024-3" })).toBeNull();
  });
});

describe("POST /api/v1/series/recompute and GET /api/v1/jobs/[id]", () => {
  it("is for coordinators and admins only", async () => {
    expect(
      (await postRecompute(await apiRequest("/api/v1/series/recompute", { method: "POST" }))).status,
    ).toBe(401);
    const asObserver = await postRecompute(
      await apiRequest("/api/v1/series/recompute", { method: "POST", userId: observerUserId() }),
    );
    expect(asObserver.status).toBe(403);
  });

  it("runs in the background and reports progress until done", async () => {
    // Two quick clicks: one job starts, the other click is handed the same job.
    const [res, again] = await Promise.all([
      postRecompute(await apiRequest("/api/v1/series/recompute", { method: "POST", userId: admin.user.id })),
      postRecompute(
        await apiRequest("/api/v1/series/recompute", { method: "POST", userId: coordinator.user.id }),
      ),
    ]);
    expect(res.status).toBe(202);
    const { job } = await res.json();
    expect(job.status).toBe("queued");
    expect(again.status).toBe(200);
    expect((await again.json()).job.id).toBe(job.id);

    await waitForRecompute({ jobId: job.id });
    const polled = await getJob(await apiRequest(`/api/v1/jobs/${job.id}`, { userId: coordinator.user.id }), {
      params: Promise.resolve({ id: job.id }),
    });
    const { job: finished } = await polled.json();
    expect(finished).toMatchObject({ status: "done", progress: 1 });
    expect(finished.message).toMatch(/Recomputed \d+ k coefficients/);
    const refused = await getJob(await apiRequest(`/api/v1/jobs/${job.id}`, { userId: observerUserId() }), {
      params: Promise.resolve({ id: job.id }),
    });
    expect(refused.status).toBe(403);
  });

  it("marks a job failed with a message when the recompute cannot run", async () => {
    await getDb().$client.execute(
      "INSERT INTO settings (key, value) VALUES ('k.referenceSeriesId', '\"no-such-series\"')",
    );
    const { createJob, getJob: readJob } = await import("@/db/queries/jobs");
    const job = await createJob({ kind: "series-recompute", requestedByUserId: coordinator.user.id });
    await runRecomputeJob({ jobId: job.id });
    const failed = await readJob({ jobId: job.id });
    expect(failed).toMatchObject({ status: "failed" });
    expect(failed!.message).toContain("reference series no longer exists");
    await getDb().$client.execute("DELETE FROM settings WHERE key = 'k.referenceSeriesId'");
  });
});
