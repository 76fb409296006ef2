/**
 * The shapes the API answers with, as zod schemas. Request schemas live in
 * lib/validation/ (the routes parse with them); these describe responses for
 * the OpenAPI document, and tests/integration/openapi.test.ts parses real
 * answers with them so the document cannot drift from the routes.
 */
import { z } from "zod";

const isoInstant = z.string().meta({ format: "date-time", description: "An instant in UT (ISO 8601)." });
const isoDay = z
  .string()
  .regex(/^\d{4}-\d{2}-\d{2}$/)
  .meta({ description: "A UT calendar day, YYYY-MM-DD." });

export const errorBodySchema = z
  .object({
    error: z.object({
      code: z.enum([
        "bad_request",
        "invalid_input",
        "invalid_json",
        "unauthenticated",
        "forbidden",
        "not_found",
        "conflict",
        "payload_too_large",
        "unsupported_media_type",
        "rate_limited",
        "internal",
        "unavailable",
      ]),
      message: z.string().meta({ description: "A sentence for a person; safe to show as it is." }),
      issues: z
        .array(z.object({ path: z.string(), message: z.string() }))
        .optional()
        .meta({ description: "One entry per field (or, for imports, per file line) that needs attention." }),
    }),
  })
  .meta({ description: "Every error answers with this shape." });

export const observationViewSchema = z.object({
  id: z.string(),
  observerId: z.string(),
  instrumentId: z.string(),
  instrumentName: z.string(),
  observedAt: isoInstant,
  utDate: isoDay,
  seeing: z.int().min(1).max(5),
  groups: z.int().min(0),
  spots: z.int().min(0),
  northGroups: z.int().nullable(),
  northSpots: z.int().nullable(),
  southGroups: z.int().nullable(),
  southSpots: z.int().nullable(),
  notes: z.string().nullable(),
  status: z.enum(["submitted", "accepted", "queried", "rejected"]),
  source: z.enum(["form", "api", "tracer", "photo", "import", "classroom", "demo"]),
  createdAt: isoInstant,
  updatedAt: isoInstant,
  k: z
    .number()
    .meta({ description: "The observer's current k for this instrument (1.0 until one is computed)." }),
  kComputed: z.boolean(),
  relativeNumber: z.number().meta({ description: "R = k(10g + s)." }),
});

export const observationPageSchema = z.object({
  data: z.array(observationViewSchema),
  page: z.int(),
  pageSize: z.int(),
  total: z.int(),
});

export const importResultSchema = z.object({
  batchId: z.string(),
  rowsRead: z.int().meta({ description: "Rows of counts in the file (the header line not included)." }),
  imported: z.int().meta({ description: "New observations stored." }),
  skipped: z
    .int()
    .meta({ description: "Lines imported before with exactly this content, left as they were." }),
  firstDay: isoDay.nullable(),
  lastDay: isoDay.nullable(),
  flags: z
    .union([
      z.object({ status: z.literal("done") }),
      z.object({ status: z.literal("running"), jobId: z.string() }),
    ])
    .meta({
      description:
        "The Review desk's automatic flags: added already, or (for large imports) by a background job.",
    }),
});

const seriesPage = <T extends z.ZodType>(row: T) =>
  z.object({
    data: z.array(row),
    page: z.int(),
    pageSize: z.int(),
    total: z.int(),
    sort: z.string(),
    hemisphere: z.enum(["all", "N", "S"]),
  });

export const dailySeriesPageSchema = seriesPage(
  z.object({
    day: isoDay,
    observers: z.int(),
    mean: z.number().meta({ description: "Mean of k·(10g + s) over the day's accepted counts." }),
    sd: z.number().nullable(),
  }),
);
export const monthlySeriesPageSchema = seriesPage(
  z.object({
    month: z.string().regex(/^\d{4}-\d{2}$/),
    days: z.int(),
    mean: z.number(),
    smoothed: z
      .number()
      .nullable()
      .meta({ description: "13-month smoothed mean (null within six months of either end)." }),
  }),
);
export const yearlySeriesPageSchema = seriesPage(
  z.object({ year: z.int(), days: z.int(), mean: z.number() }),
);

export const kHistorySchema = z.object({
  observer: z.object({ id: z.string(), code: z.string(), displayName: z.string() }),
  data: z.array(
    z.object({
      id: z.string(),
      instrumentId: z.string().nullable(),
      instrumentName: z.string().nullable(),
      periodStart: isoDay,
      periodEnd: isoDay,
      periodKind: z.string(),
      k: z.number(),
      sigma: z.number().nullable(),
      commonDays: z.int(),
      method: z.string(),
      reference: z.string(),
      referenceLabel: z.string(),
      computedAt: isoInstant,
    }),
  ),
});

export const solarOrientationSchema = z.object({
  at: isoInstant,
  p: z
    .number()
    .meta({ description: "Position angle of the rotation axis, degrees east of celestial north." }),
  b0: z.number().meta({ description: "Heliographic latitude of the disk centre, degrees." }),
  l0: z.number().meta({ description: "Carrington longitude of the disk centre, degrees." }),
  carringtonRotation: z.number(),
  semidiameterArcsec: z.number(),
  distanceAu: z.number(),
  units: z.record(z.string(), z.string()),
  model: z.string(),
});

/**
 * Names under which response schemas appear in the document's components.
 * Kept here rather than as zod `id` metadata, which would claim the names in
 * zod's global registry for the whole app.
 */
export const NAMED_RESPONSE_SCHEMAS: ReadonlyArray<readonly [string, z.ZodType]> = [
  ["Error", errorBodySchema],
  ["Observation", observationViewSchema],
  ["ObservationPage", observationPageSchema],
  ["ImportResult", importResultSchema],
  ["DailySeriesPage", dailySeriesPageSchema],
  ["MonthlySeriesPage", monthlySeriesPageSchema],
  ["YearlySeriesPage", yearlySeriesPageSchema],
  ["KHistory", kHistorySchema],
  ["SolarOrientation", solarOrientationSchema],
];
