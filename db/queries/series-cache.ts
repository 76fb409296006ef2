/**
 * The Archive's table pages, cut from memory (the same pages listSeriesPage
 * reads with SQL).
 *
 * Series change only when they are written (a review decision, a recompute),
 * and every write raises the series revision. So each hemisphere of each
 * series is read once per revision (a few thousand short rows), and every
 * page, in any sort and range, is cut from it: sorting a range in SQLite on
 * each request cost ~5 ms, checking the revision is one primary-key read
 * (measured in tests/bench/series.bench.ts). Each server process keeps its
 * own copy and checks the shared revision on every request, so several
 * servers on one database never serve a superseded series.
 */
import "server-only";

import type { Hemisphere } from "@/lib/series/network-series";
import type { SeriesKind, SeriesQuery } from "@/lib/validation/series-query";

import { getDb } from "../client";
import { SERIES_TABLES, toSeriesRow, type SeriesRowOf } from "./series-read";
import { getSeriesRevision } from "./series";

/**
 * One hemisphere of one stored series held in memory, oldest first, with the
 * orders it has been sorted in so far (positions into `rows`).
 */
type SeriesView = {
  rows: Array<Record<string, unknown>>;
  times: Array<string | number>;
  orders: Map<string, Int32Array>;
};
type Snapshot = { revision: number; views: Map<string, Promise<SeriesView>>; bodies: Map<string, string> };

/** Pages kept ready as JSON text per revision: every page a few dozen readers turn to between two decisions. */
const MAX_BODIES = 500;

const store = globalThis as unknown as { __heliotallySeriesSnapshots?: WeakMap<object, Snapshot> };

/**
 * The JSON body of GET /api/v1/series/<kind> for one page. The same page
 * asked again before the series changes is answered with the same text,
 * without cutting or serialising it again.
 */
export async function getSeriesPageJson<K extends SeriesKind>({
  kind,
  query,
}: {
  kind: K;
  query: SeriesQuery<K>;
}): Promise<string> {
  const snapshot = await getSnapshot();
  const key = JSON.stringify([
    kind,
    query.hemisphere,
    query.from,
    query.to,
    query.page,
    query.pageSize,
    query.sort.column,
    query.sort.direction,
  ]);
  const known = snapshot.bodies.get(key);
  if (known !== undefined) return known;
  const view = await getSeriesView({ snapshot, kind, hemisphere: query.hemisphere });
  const { rows, total } = cutPage({ view, kind, query });
  const body = JSON.stringify({
    data: rows,
    page: query.page,
    pageSize: query.pageSize,
    total,
    sort: `${query.sort.column}:${query.sort.direction}`,
    hemisphere: query.hemisphere,
  });
  if (snapshot.bodies.size >= MAX_BODIES) snapshot.bodies.delete(snapshot.bodies.keys().next().value!);
  snapshot.bodies.set(key, body);
  return body;
}

function cutPage<K extends SeriesKind>({
  view,
  kind,
  query,
}: {
  view: SeriesView;
  kind: K;
  query: SeriesQuery<K>;
}): { rows: Array<SeriesRowOf<K>>; total: number } {
  const { column, direction } = query.sort;
  const time = SERIES_TABLES[kind].time;
  const bound = (value: string | undefined) =>
    value === undefined ? undefined : kind === "yearly" ? Number(value) : value;
  const first = lowerBound(view.times, bound(query.from));
  const end = upperBound(view.times, bound(query.to));
  const total = Math.max(0, end - first);
  const offset = (query.page - 1) * query.pageSize;
  const rows: Array<SeriesRowOf<K>> = [];
  if (offset >= total) return { rows, total };

  if (column === time) {
    // Time order is the stored order: the page is a slice.
    for (let n = offset; n < total && rows.length < query.pageSize; n++) {
      const position = direction === "asc" ? first + n : end - 1 - n;
      rows.push(view.rows[position] as SeriesRowOf<K>);
    }
    return { rows, total };
  }
  const order = sortedOrder({ view, column, direction });
  let skipped = 0;
  for (let n = 0; n < order.length && rows.length < query.pageSize; n++) {
    const position = order[n] as number;
    if (position < first || position >= end) continue;
    if (skipped < offset) skipped++;
    else rows.push(view.rows[position] as SeriesRowOf<K>);
  }
  return { rows, total };
}

async function getSnapshot(): Promise<Snapshot> {
  const revision = await getSeriesRevision();
  // Per database client: two databases opened in one process (tests, the
  // bench) may well be at the same revision number.
  const snapshots = (store.__heliotallySeriesSnapshots ??= new WeakMap());
  const client = getDb().$client;
  let snapshot = snapshots.get(client);
  if (!snapshot || snapshot.revision !== revision) {
    snapshot = { revision, views: new Map(), bodies: new Map() };
    snapshots.set(client, snapshot);
  }
  return snapshot;
}

function getSeriesView({
  snapshot,
  kind,
  hemisphere,
}: {
  snapshot: Snapshot;
  kind: SeriesKind;
  hemisphere: Hemisphere;
}): Promise<SeriesView> {
  const key = `${kind}|${hemisphere}`;
  let view = snapshot.views.get(key);
  if (!view) {
    view = loadSeriesView({ kind, hemisphere });
    snapshot.views.set(key, view);
    // A failed read is not kept: the next request tries again.
    view.catch(() => {
      if (snapshot.views.get(key) === view) snapshot.views.delete(key);
    });
  }
  return view;
}

async function loadSeriesView({
  kind,
  hemisphere,
}: {
  kind: SeriesKind;
  hemisphere: Hemisphere;
}): Promise<SeriesView> {
  const { table, time, columns } = SERIES_TABLES[kind];
  const result = await getDb().$client.execute({
    sql: `SELECT ${columns.join(", ")} FROM ${table} WHERE hemisphere = ? ORDER BY ${time} ASC`,
    args: [hemisphere],
  });
  const rows = result.rows.map((row) => toSeriesRow(kind, row) as Record<string, unknown>);
  return { rows, times: rows.map((row) => row[time] as string | number), orders: new Map() };
}

/**
 * Positions in the order SQL's `ORDER BY column dir NULLS LAST, time DESC`
 * gives (the order listSeriesPage uses), built once per view and column.
 */
function sortedOrder({
  view,
  column,
  direction,
}: {
  view: SeriesView;
  column: string;
  direction: "asc" | "desc";
}): Int32Array {
  const key = `${column}:${direction}`;
  const known = view.orders.get(key);
  if (known) return known;
  const values = view.rows.map((row) => row[column] as number | null);
  const sign = direction === "asc" ? 1 : -1;
  const order = Int32Array.from(values.keys()).sort((a, b) => {
    const x = values[a] as number | null;
    const y = values[b] as number | null;
    if (x === null || y === null) return x === y ? b - a : x === null ? 1 : -1;
    // Equal values: newest first; positions follow time, so the later position.
    return x === y ? b - a : sign * (x - y);
  });
  view.orders.set(key, order);
  return order;
}

/** First position whose time is at or after `bound` (0 without a bound). */
function lowerBound(times: ReadonlyArray<string | number>, bound: string | number | undefined): number {
  if (bound === undefined) return 0;
  let low = 0;
  let high = times.length;
  while (low < high) {
    const middle = (low + high) >>> 1;
    if ((times[middle] as string | number) < bound) low = middle + 1;
    else high = middle;
  }
  return low;
}

/** First position whose time is after `bound` (the length without a bound). */
function upperBound(times: ReadonlyArray<string | number>, bound: string | number | undefined): number {
  if (bound === undefined) return times.length;
  let low = 0;
  let high = times.length;
  while (low < high) {
    const middle = (low + high) >>> 1;
    if ((times[middle] as string | number) <= bound) low = middle + 1;
    else high = middle;
  }
  return low;
}
