import { z } from "zod";

import { toDayNumber } from "@/lib/counts/series";

import { pagingFields, fromNotAfterTo, RANGE_ORDER_ISSUE, unknownQueryParameter } from "./query-fields";

export const SERIES_KINDS = ["daily", "monthly", "yearly"] as const;
export type SeriesKind = (typeof SERIES_KINDS)[number];

/** Columns each table can be sorted by; the first is the default (newest first). */
export const SERIES_SORT_COLUMNS = {
  daily: ["day", "mean", "observers", "sd"],
  monthly: ["month", "mean", "smoothed", "days"],
  yearly: ["year", "mean", "days"],
} as const satisfies Record<SeriesKind, readonly string[]>;

export type SeriesSortColumn<K extends SeriesKind = SeriesKind> = (typeof SERIES_SORT_COLUMNS)[K][number];

const isCalendarDay = (d: string) => {
  try {
    toDayNumber(d);
    return true;
  } catch {
    return false;
  }
};

const BOUND = {
  daily: z
    .string()
    .regex(/^\d{4}-\d{2}-\d{2}$/, { error: "Use a day like 2026-03-14." })
    .refine(isCalendarDay, { error: "That is not a calendar day." }),
  monthly: z.string().regex(/^\d{4}-(0[1-9]|1[0-2])$/, { error: "Use a month like 2026-03." }),
  yearly: z.string().regex(/^\d{4}$/, { error: "Use a year like 2026." }),
} as const;

/**
 * Query string of GET /api/v1/series/<kind>: hemisphere, an inclusive
 * from/to range (days, months "YYYY-MM" or years), a page and a sort
 * "column:asc|desc". format=csv answers the whole filtered range as CSV.
 */
export function seriesQuerySchema<K extends SeriesKind>(kind: K) {
  // Building a zod schema costs about a millisecond, twenty times a parse:
  // the Archive table asks on every page turn, so each kind is built once.
  const cached = builtSchemas.get(kind);
  if (cached) return cached as ReturnType<typeof buildSeriesQuerySchema<K>>;
  const schema = buildSeriesQuerySchema(kind);
  builtSchemas.set(kind, schema);
  return schema;
}

const builtSchemas = new Map<SeriesKind, unknown>();

function buildSeriesQuerySchema<K extends SeriesKind>(kind: K) {
  const columns = SERIES_SORT_COLUMNS[kind] as readonly string[];
  const sorts = columns.flatMap((c) => [`${c}:asc`, `${c}:desc`]) as [string, ...string[]];
  return z
    .strictObject(
      {
        hemisphere: z.enum(["all", "N", "S"], { error: "hemisphere is all, N or S." }).default("all"),
        from: BOUND[kind].optional(),
        to: BOUND[kind].optional(),
        ...pagingFields({ defaultSize: 50, maxSize: 500 }),
        sort: z.enum(sorts, { error: `sort is one of ${sorts.join(", ")}.` }).default(`${columns[0]}:desc`),
        format: z.enum(["json", "csv"], { error: "format is json or csv." }).default("json"),
      },
      { error: unknownQueryParameter },
    )
    .refine(fromNotAfterTo, RANGE_ORDER_ISSUE)
    .transform((q) => {
      const [column, direction] = q.sort.split(":") as [SeriesSortColumn<K>, "asc" | "desc"];
      return { ...q, sort: { column, direction } };
    });
}

export type SeriesQuery<K extends SeriesKind = SeriesKind> = z.output<
  ReturnType<typeof buildSeriesQuerySchema<K>>
>;

/** "daily", "daily.csv" → the kind and whether CSV was asked for by the path. */
export function parseSeriesPath(segment: string): { kind: SeriesKind; csv: boolean } | null {
  const match = /^(daily|monthly|yearly)(\.csv)?$/.exec(segment);
  if (!match) return null;
  return { kind: match[1] as SeriesKind, csv: Boolean(match[2]) };
}

export const observerChartQuerySchema = z.strictObject(
  { observerId: z.string().trim().min(1, { error: "Choose an observer." }).max(64).optional() },
  { error: unknownQueryParameter },
);
