import { beforeAll, describe, expect, it } from "vitest";

import { getDb } from "@/db/client";
import { bumpSeriesRevisionStatement, insertRows } from "@/db/queries/series";
import { getSeriesPageJson } from "@/db/queries/series-cache";
import { listSeriesPage } from "@/db/queries/series-read";
import { formatDayNumber } from "@/lib/counts/series";
import { SERIES_KINDS, seriesQuerySchema, type SeriesKind } from "@/lib/validation/series-query";

import { createRandom } from "../unit/counts/helpers";

/**
 * The Archive's table pages are cut from an in-memory copy of each series;
 * SQL's ORDER BY/LIMIT over the stored table (listSeriesPage) is the
 * reference they must match, page for page, including ties and missing
 * values.
 */
async function fillSeries() {
  const random = createRandom(4242);
  const tx = await getDb().$client.transaction("write");
  const daily: unknown[][] = [];
  const monthly: unknown[][] = [];
  const yearly: unknown[][] = [];
  for (const hemisphere of ["all", "N", "S"]) {
    for (let d = 0; d < 800; d++) {
      if (random() < 0.1) continue; // clouded-out days
      // Few distinct values, so ties are common; one day in five has no spread.
      const mean = Math.round(random() * 20) * 5;
      daily.push([
        formatDayNumber(19_000 + d),
        hemisphere,
        1 + Math.floor(random() * 4),
        mean,
        mean * mean,
        mean,
        random() < 0.2 ? null : Math.round(random() * 6),
      ]);
    }
    for (let m = 0; m < 40; m++) {
      const month = `${2020 + Math.floor(m / 12)}-${String((m % 12) + 1).padStart(2, "0")}`;
      const mean = Math.round(random() * 10) * 10;
      monthly.push([
        month,
        hemisphere,
        20,
        mean * 20,
        mean,
        m < 6 || m > 33 ? null : Math.round(random() * 4) * 25,
      ]);
    }
    for (let y = 0; y < 12; y++)
      yearly.push([2014 + y, hemisphere, 300 - (y % 3), Math.round(random() * 3) * 40]);
  }
  await insertRows({
    tx,
    table: "series_daily",
    columns: ["day", "hemisphere", "observers", "sum", "sum_squares", "mean", "sd"],
    rows: daily,
  });
  await insertRows({
    tx,
    table: "series_monthly",
    columns: ["month", "hemisphere", "days", "sum_of_daily_means", "mean", "smoothed"],
    rows: monthly,
  });
  await insertRows({
    tx,
    table: "series_yearly",
    columns: ["year", "hemisphere", "days", "mean"],
    rows: yearly,
  });
  await tx.execute(bumpSeriesRevisionStatement());
  await tx.commit();
}

async function readPage(...args: Parameters<typeof getSeriesPageJson>) {
  const { data, total } = JSON.parse(await getSeriesPageJson(...args)) as { data: unknown[]; total: number };
  return { rows: data, total };
}

const RANGES: Record<SeriesKind, Array<[string | undefined, string | undefined]>> = {
  daily: [
    [undefined, undefined],
    ["2022-01-10", "2022-06-30"],
    ["2021-12-31", undefined],
    [undefined, "2022-02-01"],
    ["2030-01-01", undefined],
  ],
  monthly: [
    [undefined, undefined],
    ["2020-06", "2021-07"],
    [undefined, "2020-01"],
  ],
  yearly: [
    [undefined, undefined],
    ["2016", "2021"],
    ["2025", "2040"],
  ],
};

describe("Archive table pages from memory", () => {
  beforeAll(fillSeries);

  it("match SQL's ORDER BY … NULLS LAST, time DESC / LIMIT / OFFSET for every sort, range and page", async () => {
    let compared = 0;
    for (const kind of SERIES_KINDS) {
      const schema = seriesQuerySchema(kind);
      const sorts = schema.parse({}).sort; // the default, then every other below
      expect(sorts.direction).toBe("desc");
      const columns = {
        daily: ["day", "mean", "observers", "sd"],
        monthly: ["month", "mean", "smoothed", "days"],
        yearly: ["year", "mean", "days"],
      }[kind];
      for (const column of columns)
        for (const direction of ["asc", "desc"])
          for (const hemisphere of ["all", "N", "S"])
            for (const [from, to] of RANGES[kind])
              for (const [page, pageSize] of [
                [1, 50],
                [2, 50],
                [3, 7],
                [40, 20],
                [1, 500],
              ] as const) {
                const query = schema.parse({
                  hemisphere,
                  sort: `${column}:${direction}`,
                  page: String(page),
                  pageSize: String(pageSize),
                  ...(from ? { from } : {}),
                  ...(to ? { to } : {}),
                });
                const expected = await listSeriesPage({ kind, query });
                const actual = await readPage({ kind, query });
                expect(actual, JSON.stringify({ kind, query })).toEqual(expected);
                compared++;
              }
    }
    expect(compared).toBeGreaterThan(500);
  });

  it("serves the new series as soon as a write raises the revision", async () => {
    const query = seriesQuerySchema("yearly").parse({ hemisphere: "N", sort: "year:asc", pageSize: "1" });
    const before = await readPage({ kind: "yearly", query });
    expect(before.rows[0]).toMatchObject({ year: 2014 });
    const tx = await getDb().$client.transaction("write");
    await tx.execute("UPDATE series_yearly SET mean = 999.5 WHERE year = 2014 AND hemisphere = 'N'");
    await tx.execute(bumpSeriesRevisionStatement());
    await tx.commit();
    const after = await readPage({ kind: "yearly", query });
    expect(after.rows[0]).toEqual({ year: 2014, days: 300, mean: 999.5 });
  });
});
