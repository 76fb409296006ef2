import "server-only";

import type { Row } from "@libsql/client";

import type { Hemisphere } from "@/lib/series/network-series";
import { describeMonthDays, parseMonth } from "@/lib/series/periods";
import type { SeriesKind, SeriesQuery } from "@/lib/validation/series-query";

import { getDb } from "../client";
import { K_FOR_OBSERVATION_SQL } from "./series";

// ---------------------------------------------------------------------------
// Table pages and CSV
// ---------------------------------------------------------------------------

export type DailySeriesRow = { day: string; observers: number; mean: number; sd: number | null };
export type MonthlySeriesRow = { month: string; days: number; mean: number; smoothed: number | null };
export type YearlySeriesRow = { year: number; days: number; mean: number };
export type SeriesRowOf<K extends SeriesKind> = K extends "daily"
  ? DailySeriesRow
  : K extends "monthly"
    ? MonthlySeriesRow
    : YearlySeriesRow;

/** Table, time column and the columns each kind answers with; sort columns are checked by the query schema. */
export const SERIES_TABLES = {
  daily: { table: "series_daily", time: "day", columns: ["day", "observers", "mean", "sd"] },
  monthly: { table: "series_monthly", time: "month", columns: ["month", "days", "mean", "smoothed"] },
  yearly: { table: "series_yearly", time: "year", columns: ["year", "days", "mean"] },
} as const;

const SORTABLE = new Set(["day", "month", "year", "mean", "observers", "sd", "smoothed", "days"]);

function buildFilter({
  kind,
  query,
}: {
  kind: SeriesKind;
  query: Pick<SeriesQuery, "hemisphere" | "from" | "to">;
}) {
  const time = SERIES_TABLES[kind].time;
  const clauses = ["hemisphere = ?"];
  const args: Array<string | number> = [query.hemisphere];
  const bound = (value: string) => (kind === "yearly" ? Number(value) : value);
  if (query.from) {
    clauses.push(`${time} >= ?`);
    args.push(bound(query.from));
  }
  if (query.to) {
    clauses.push(`${time} <= ?`);
    args.push(bound(query.to));
  }
  return { where: clauses.join(" AND "), args };
}

export function toSeriesRow(kind: SeriesKind, row: Row): DailySeriesRow | MonthlySeriesRow | YearlySeriesRow {
  const nullable = (v: unknown) => (v === null || v === undefined ? null : Number(v));
  if (kind === "daily")
    return {
      day: String(row.day),
      observers: Number(row.observers),
      mean: Number(row.mean),
      sd: nullable(row.sd),
    };
  if (kind === "monthly")
    return {
      month: String(row.month),
      days: Number(row.days),
      mean: Number(row.mean),
      smoothed: nullable(row.smoothed),
    };
  return { year: Number(row.year), days: Number(row.days), mean: Number(row.mean) };
}

/**
 * One page of a stored series, sorted on one column (ties broken by time,
 * newest first), with the number of rows the filter matches. Both reads
 * run on the primary key (hemisphere, time), so they stay cheap however
 * long the archive grows.
 */
export async function listSeriesPage<K extends SeriesKind>({
  kind,
  query,
}: {
  kind: K;
  query: SeriesQuery<K>;
}): Promise<{ rows: Array<SeriesRowOf<K>>; total: number }> {
  const { table, time, columns } = SERIES_TABLES[kind];
  const { column, direction } = query.sort;
  if (!SORTABLE.has(column)) throw new Error(`Unsortable column ${column}`);
  const { where, args } = buildFilter({ kind, query });
  const order = `${column} ${direction === "asc" ? "ASC" : "DESC"} NULLS LAST${column === time ? "" : `, ${time} DESC`}`;
  const [page, count] = await getDb().$client.batch(
    [
      {
        sql: `SELECT ${columns.join(", ")} FROM ${table} WHERE ${where} ORDER BY ${order} LIMIT ? OFFSET ?`,
        args: [...args, query.pageSize, (query.page - 1) * query.pageSize],
      },
      { sql: `SELECT count(*) AS n FROM ${table} WHERE ${where}`, args },
    ],
    "read",
  );
  return {
    rows: page!.rows.map((r) => toSeriesRow(kind, r)) as Array<SeriesRowOf<K>>,
    total: Number(count!.rows[0]?.n ?? 0),
  };
}

const CSV_HEADERS = {
  daily: ["day", "hemisphere", "observers", "relative_number", "sd"],
  monthly: ["month", "hemisphere", "days", "relative_number", "smoothed_13_month"],
  yearly: ["year", "hemisphere", "days", "relative_number"],
} as const;

const formatCsvNumber = (value: number | null, decimals: number) =>
  value === null ? "" : value.toFixed(decimals);

/**
 * The filtered range of a series as CSV, oldest first, with values at three
 * decimals (more than k's own precision, so nothing is lost by rounding).
 */
export async function exportSeriesCsv({
  kind,
  query,
}: {
  kind: SeriesKind;
  query: Pick<SeriesQuery, "hemisphere" | "from" | "to">;
}): Promise<string> {
  const { table, time, columns } = SERIES_TABLES[kind];
  const { where, args } = buildFilter({ kind, query });
  const result = await getDb().$client.execute({
    sql: `SELECT ${columns.join(", ")} FROM ${table} WHERE ${where} ORDER BY ${time} ASC`,
    args,
  });
  const lines: string[] = [CSV_HEADERS[kind].join(",")];
  for (const raw of result.rows) {
    const row = toSeriesRow(kind, raw);
    if ("day" in row)
      lines.push(
        [
          row.day,
          query.hemisphere,
          row.observers,
          formatCsvNumber(row.mean, 3),
          formatCsvNumber(row.sd, 3),
        ].join(","),
      );
    else if ("month" in row)
      lines.push(
        [
          row.month,
          query.hemisphere,
          row.days,
          formatCsvNumber(row.mean, 3),
          formatCsvNumber(row.smoothed, 3),
        ].join(","),
      );
    else lines.push([row.year, query.hemisphere, row.days, formatCsvNumber(row.mean, 3)].join(","));
  }
  return `${lines.join("\n")}\n`;
}

// ---------------------------------------------------------------------------
// Chart data
// ---------------------------------------------------------------------------

/** Parallel arrays, the shape chart libraries want: x (UT days or months as "YYYY-MM-DD"), then values (null for gaps). */
export type ChartSeries = {
  daily: {
    days: string[];
    all: Array<number | null>;
    north: Array<number | null>;
    south: Array<number | null>;
    observers: number[];
  };
  monthly: {
    months: string[];
    all: Array<number | null>;
    allSmoothed: Array<number | null>;
    north: Array<number | null>;
    northSmoothed: Array<number | null>;
    south: Array<number | null>;
    southSmoothed: Array<number | null>;
  };
};

/**
 * Every daily and monthly value, all three hemispheres aligned on one time
 * axis. Each table comes back as one JSON array from the database: thousands
 * of small rows cost far more to hand over one at a time.
 */
export async function getChartSeries(): Promise<ChartSeries> {
  const [dailyResult, monthlyResult] = await getDb().$client.batch(
    [
      "SELECT json_group_array(json_array(day, hemisphere, mean, observers)) AS packed FROM (SELECT day, hemisphere, mean, observers FROM series_daily ORDER BY day)",
      "SELECT json_group_array(json_array(month, hemisphere, mean, smoothed)) AS packed FROM (SELECT month, hemisphere, mean, smoothed FROM series_monthly ORDER BY month)",
    ],
    "read",
  );
  const daily = JSON.parse(String(dailyResult!.rows[0]?.packed ?? "[]")) as Array<
    [string, Hemisphere, number, number]
  >;
  const monthly = JSON.parse(String(monthlyResult!.rows[0]?.packed ?? "[]")) as Array<
    [string, Hemisphere, number, number | null]
  >;

  const chart: ChartSeries = {
    daily: { days: [], all: [], north: [], south: [], observers: [] },
    monthly: {
      months: [],
      all: [],
      allSmoothed: [],
      north: [],
      northSmoothed: [],
      south: [],
      southSmoothed: [],
    },
  };
  const dayIndex = new Map<string, number>();
  for (const [day, hemisphere, mean, observers] of daily) {
    let i = dayIndex.get(day);
    if (i === undefined) {
      i = chart.daily.days.length;
      dayIndex.set(day, i);
      chart.daily.days.push(day);
      chart.daily.all.push(null);
      chart.daily.north.push(null);
      chart.daily.south.push(null);
      chart.daily.observers.push(0);
    }
    if (hemisphere === "all") {
      chart.daily.all[i] = mean;
      chart.daily.observers[i] = observers;
    } else if (hemisphere === "N") chart.daily.north[i] = mean;
    else chart.daily.south[i] = mean;
  }
  const monthIndex = new Map<string, number>();
  for (const [month, hemisphere, mean, smoothed] of monthly) {
    let i = monthIndex.get(month);
    if (i === undefined) {
      i = chart.monthly.months.length;
      monthIndex.set(month, i);
      chart.monthly.months.push(`${month}-15`);
      for (const key of ["all", "allSmoothed", "north", "northSmoothed", "south", "southSmoothed"] as const)
        chart.monthly[key].push(null);
    }
    const [valueKey, smoothedKey] =
      hemisphere === "all"
        ? (["all", "allSmoothed"] as const)
        : hemisphere === "N"
          ? (["north", "northSmoothed"] as const)
          : (["south", "southSmoothed"] as const);
    chart.monthly[valueKey][i] = mean;
    chart.monthly[smoothedKey][i] = smoothed;
  }
  return chart;
}

export type ObserverAgainstNetwork = {
  days: string[];
  /** The observer's k(10g + s) (averaged when they sent more than one count that day). */
  observer: number[];
  /** The network's daily index on the same days (null where the day has no stored value). */
  network: Array<number | null>;
  /** The observer's raw 10g + s. */
  raw: number[];
};

/** An observer's accepted counts, scaled by the k that the series uses, beside the network's daily index. */
export async function getObserverAgainstNetwork({
  observerId,
}: {
  observerId: string;
}): Promise<ObserverAgainstNetwork> {
  const result = await getDb().$client.execute({
    sql: `SELECT json_group_array(json_array(day, raw, scaled, network)) AS packed FROM (
            SELECT o.ut_date AS day, avg(10 * o.groups + o.spots) AS raw, avg((10 * o.groups + o.spots) * ${K_FOR_OBSERVATION_SQL}) AS scaled,
                   (SELECT sd.mean FROM series_daily sd WHERE sd.hemisphere = 'all' AND sd.day = o.ut_date) AS network
            FROM observations o
            WHERE o.observer_id = ? AND o.status = 'accepted'
            GROUP BY o.ut_date ORDER BY o.ut_date)`,
    args: [observerId],
  });
  const rows = JSON.parse(String(result.rows[0]?.packed ?? "[]")) as Array<
    [string, number, number, number | null]
  >;
  return {
    days: rows.map((r) => r[0]),
    raw: rows.map((r) => r[1]),
    observer: rows.map((r) => r[2]),
    network: rows.map((r) => r[3]),
  };
}

export type GroupLatitudes = { days: string[]; latitudes: number[]; hemispheres: Array<"N" | "S"> };

/**
 * Heliographic latitudes of the groups measured on accepted counts (the disk
 * tracer fills observation_groups), one point per group, in day order.
 */
export async function listGroupLatitudes(): Promise<GroupLatitudes> {
  const result = await getDb().$client.execute(
    `SELECT json_group_array(json_array(day, latitude, hemisphere)) AS packed FROM (
       SELECT o.ut_date AS day, g.latitude_deg AS latitude, g.hemisphere AS hemisphere
       FROM observation_groups g JOIN observations o ON o.id = g.observation_id
       WHERE o.status = 'accepted'
       ORDER BY o.ut_date)`,
  );
  const rows = JSON.parse(String(result.rows[0]?.packed ?? "[]")) as Array<[string, number, "N" | "S"]>;
  return {
    days: rows.map((r) => r[0]),
    latitudes: rows.map((r) => r[1]),
    hemispheres: rows.map((r) => r[2]),
  };
}

// ---------------------------------------------------------------------------
// Monthly report
// ---------------------------------------------------------------------------

export type MonthReport = {
  month: string;
  days: Array<{ day: string; all: DailySeriesRow | null; north: number | null; south: number | null }>;
  means: Record<Hemisphere, MonthlySeriesRow | null>;
  observers: Array<{
    displayName: string;
    code: string;
    instrumentName: string;
    counts: number;
    k: number;
    meanRaw: number;
  }>;
};

/** Everything the printable monthly report shows; null for a malformed month. */
export async function getMonthReport({ month }: { month: string }): Promise<MonthReport | null> {
  const monthIndex = parseMonth(month);
  if (monthIndex === null) return null;
  const { first, last } = describeMonthDays(monthIndex);
  const [dailyResult, monthlyResult, observersResult] = await getDb().$client.batch(
    [
      {
        sql: "SELECT day, hemisphere, observers, mean, sd FROM series_daily WHERE hemisphere IN ('all', 'N', 'S') AND day BETWEEN ? AND ? ORDER BY day",
        args: [first, last],
      },
      {
        sql: "SELECT month, hemisphere, days, mean, smoothed FROM series_monthly WHERE hemisphere IN ('all', 'N', 'S') AND month = ?",
        args: [month],
      },
      {
        sql: `SELECT ob.display_name AS displayName, ob.code AS code, i.name AS instrumentName, count(*) AS counts,
                     avg(10 * o.groups + o.spots) AS meanRaw, max(${K_FOR_OBSERVATION_SQL}) AS k
              FROM observations o
              JOIN observers ob ON ob.id = o.observer_id
              JOIN instruments i ON i.id = o.instrument_id
              WHERE o.status = 'accepted' AND o.ut_date BETWEEN ? AND ?
              GROUP BY o.observer_id, o.instrument_id
              ORDER BY ob.display_name, i.name`,
        args: [first, last],
      },
    ],
    "read",
  );
  const byDay = new Map<string, MonthReport["days"][number]>();
  for (const row of dailyResult!.rows) {
    const day = String(row.day);
    const entry = byDay.get(day) ?? { day, all: null, north: null, south: null };
    if (row.hemisphere === "all") entry.all = toSeriesRow("daily", row) as DailySeriesRow;
    else if (row.hemisphere === "N") entry.north = Number(row.mean);
    else entry.south = Number(row.mean);
    byDay.set(day, entry);
  }
  const means: MonthReport["means"] = { all: null, N: null, S: null };
  for (const row of monthlyResult!.rows)
    means[String(row.hemisphere) as Hemisphere] = toSeriesRow("monthly", row) as MonthlySeriesRow;
  return {
    month,
    days: [...byDay.values()],
    means,
    observers: observersResult!.rows.map((r) => ({
      displayName: String(r.displayName),
      code: String(r.code),
      instrumentName: String(r.instrumentName),
      counts: Number(r.counts),
      k: Number(r.k),
      meanRaw: Number(r.meanRaw),
    })),
  };
}

/** The newest month with a stored value: where the report link starts. */
export async function findLatestSeriesMonth(): Promise<string | null> {
  const result = await getDb().$client.execute(
    "SELECT max(month) AS month FROM series_monthly WHERE hemisphere = 'all'",
  );
  const month = result.rows[0]?.month;
  return month === null || month === undefined ? null : String(month);
}
