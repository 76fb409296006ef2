/**
 * The shapes the API answers with, as zod schemas. Request schemas live in
 * lib/validation/ (the routes parse with them); these describe responses for
 * the OpenAPI document, and tests/integration/openapi.test.ts parses real
 * answers with them so the document cannot drift from the routes.
 */
import { z } from "zod";

import {
  FLAG_REASONS,
  INSTRUMENT_KINDS,
  JOB_STATUSES,
  OBSERVATION_STATUSES,
  REVIEW_ACTIONS,
} from "@/db/schema";
import { K_METHODS, type KMethod } from "@/lib/counts/k-coefficient";
import { K_PERIOD_KINDS } from "@/lib/series/periods";
import { ROLES } from "@/lib/auth/roles";
import { REVIEW_DECISION_ACTIONS } from "@/lib/validation/review";

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
  data: z.array(
    observationViewSchema.extend({
      photoId: z.string().nullable().meta({ description: "The newest photo of the count, if any." }),
    }),
  ),
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

export const instrumentViewSchema = z.object({
  id: z.string(),
  observerId: z.string(),
  name: z.string(),
  kind: z.enum(INSTRUMENT_KINDS),
  params: z
    .record(z.string(), z.unknown())
    .meta({ description: "The kind's measurements as sent (lengths in mm, angles in degrees)." }),
  notes: z.string().nullable(),
  archivedAt: isoInstant.nullable(),
  createdAt: isoInstant,
  observationCount: z.int().meta({ description: "Observations made with it (then it cannot be deleted)." }),
  k: z
    .object({ k: z.number(), sigma: z.number().nullable(), periodStart: isoDay, periodEnd: isoDay })
    .nullable()
    .meta({ description: "The newest k computed for this instrument, if any." }),
});

export const instrumentListSchema = z.object({ data: z.array(instrumentViewSchema) });

const tracedGroupSchema = z.object({
  number: z.int(),
  spots: z.int(),
  zurichClass: z.string().nullable(),
  mcintoshClass: z.string().nullable(),
  latitudeDeg: z.number().meta({ description: "Heliographic latitude, degrees (north positive)." }),
  cmdDeg: z.number().meta({ description: "Central meridian distance, degrees (west positive)." }),
  carringtonLonDeg: z.number(),
  hemisphere: z.enum(["N", "S"]),
  areaMsh: z.number().nullable().meta({ description: "Area in millionths of the solar hemisphere." }),
});

export const tracingViewSchema = z.object({
  observationId: z.string(),
  observedAt: isoInstant,
  revision: z.int(),
  formatVersion: z.int(),
  updatedAt: isoInstant,
  document: z
    .record(z.string(), z.unknown())
    .meta({ description: "The tracing as saved: the same vector document the save sends." }),
  groups: z.array(tracedGroupSchema),
  pngUrl: z.string().nullable().meta({ description: "The rendered picture, when one was saved." }),
});

const countsSchema = z.object({
  groups: z.int(),
  spots: z.int(),
  northGroups: z.int().nullable(),
  northSpots: z.int().nullable(),
  southGroups: z.int().nullable(),
  southSpots: z.int().nullable(),
});

export const tracingSavedSchema = z.object({
  observationId: z.string(),
  revision: z.int().meta({ description: "Send this as baseRevision with the next save." }),
  counts: countsSchema.meta({ description: "The observation's counts as stored." }),
  tracingCounts: countsSchema.meta({ description: "The counts the tracing itself gives." }),
  differsFromTracing: z.boolean(),
  groups: z.array(tracedGroupSchema),
});

export const photoViewSchema = z.object({
  id: z.string(),
  observationId: z.string().nullable(),
  name: z.string(),
  sizeBytes: z.int(),
  mimeType: z.string(),
  widthPx: z.int().nullable(),
  heightPx: z.int().nullable(),
  exifTakenAt: isoInstant.nullable(),
  createdAt: isoInstant,
  imageUrl: z.string(),
  thumbnailUrl: z.string(),
});

export const jobSchema = z.object({
  job: z.object({
    id: z.string(),
    kind: z.string(),
    status: z.enum(JOB_STATUSES),
    progress: z.number().min(0).max(1),
    message: z.string().nullable(),
    createdAt: isoInstant,
    startedAt: isoInstant.nullable(),
    finishedAt: isoInstant.nullable(),
  }),
});

export const kSettingsViewSchema = z.object({
  periodKind: z.enum(K_PERIOD_KINDS),
  method: z.enum(K_METHODS as [KMethod, ...KMethod[]]),
  minCommonDays: z.int(),
  referenceSeriesId: z.string().meta({ description: '"network" or the id of an imported reference series.' }),
  pilotObserverId: z.string().nullable(),
  pilotK: z.number(),
  driftFraction: z.number(),
});

export const referenceSeriesViewSchema = z.object({
  id: z.string(),
  name: z.string(),
  licence: z.string(),
  source: z.string().nullable(),
  firstDay: isoDay,
  lastDay: isoDay,
  days: z.int(),
  importedAt: isoInstant,
  importedBy: z.string().nullable(),
});

export const referenceSeriesListSchema = z.object({ data: z.array(referenceSeriesViewSchema) });

export const reviewQueuePageSchema = z.object({
  data: z.array(
    z.object({
      id: z.string(),
      observerId: z.string(),
      observerName: z.string(),
      observerCode: z.string(),
      instrumentName: z.string(),
      observedAt: isoInstant,
      utDate: isoDay,
      receivedAt: isoInstant,
      status: z.enum(OBSERVATION_STATUSES),
      groups: z.int(),
      spots: z.int(),
      k: z.number(),
      scaledValue: z.number().meta({ description: "k(10g + s) with the observer's current k." }),
      network: z
        .object({ median: z.number(), n: z.int() })
        .nullable()
        .meta({ description: "Median of the other observers' scaled counts that UT day, and how many." }),
      flags: z.array(z.object({ reason: z.enum(FLAG_REASONS), detail: z.string() })),
      lastQuery: z
        .object({ note: z.string().nullable(), askedAt: isoInstant })
        .nullable()
        .meta({ description: "The latest question sent to the observer about this count, if any." }),
    }),
  ),
  page: z.int(),
  pageSize: z.int(),
  total: z.int(),
  counts: z.object({ submitted: z.int(), queried: z.int() }),
});

export const reviewDecisionResultSchema = z.object({
  action: z.enum(REVIEW_DECISION_ACTIONS),
  status: z.enum(OBSERVATION_STATUSES).meta({ description: "The status the observations now have." }),
  decided: z.int(),
  seriesRefreshed: z
    .boolean()
    .meta({ description: "False when the series could not be brought up to date (a recompute will)." }),
  mail: z.object({ sent: z.int(), failed: z.int() }),
});

export const decisionLogPageSchema = z.object({
  data: z.array(
    z.object({
      id: z.string(),
      decidedAt: isoInstant,
      action: z.enum(REVIEW_ACTIONS).meta({
        description:
          "What happened: accepted, queried, rejected, reopened, or resubmitted (by the observer).",
      }),
      fromStatus: z.enum(OBSERVATION_STATUSES),
      toStatus: z.enum(OBSERVATION_STATUSES),
      note: z.string().nullable().meta({ description: "Why, as written by whoever decided." }),
      actorName: z.string().nullable(),
      actorRole: z.enum(ROLES),
      observationId: z.string(),
      utDate: isoDay,
      currentStatus: z.enum(OBSERVATION_STATUSES).meta({ description: "The observation's status now." }),
      observerName: z.string(),
      observerCode: z.string(),
    }),
  ),
  page: z.int(),
  pageSize: z.int(),
  total: z.int(),
});

const gapped = z.array(z.number().nullable());

export const chartSeriesSchema = z
  .object({
    daily: z.object({
      days: z.array(isoDay),
      all: gapped,
      north: gapped,
      south: gapped,
      observers: z.array(z.int()),
    }),
    monthly: z.object({
      months: z.array(z.string()),
      all: gapped,
      allSmoothed: gapped,
      north: gapped,
      northSmoothed: gapped,
      south: gapped,
      southSmoothed: gapped,
    }),
  })
  .meta({ description: "Parallel arrays on one time axis; null where a value is missing." });

export const groupLatitudesSchema = z
  .object({
    days: z.array(isoDay),
    latitudes: z.array(z.number()),
    hemispheres: z.array(z.enum(["N", "S"])),
  })
  .meta({ description: "One point per measured group on accepted counts, as parallel arrays in day order." });

export const observerChartSchema = z.object({
  observer: z.object({
    id: z.string(),
    displayName: z.string(),
    code: z.string(),
    country: z.string().nullable(),
  }),
  points: z.object({
    days: z.array(isoDay),
    observer: z.array(z.number()).meta({ description: "The observer's k(10g + s), a day's mean." }),
    network: gapped.meta({ description: "The network's daily index on the same days." }),
    raw: z.array(z.number()).meta({ description: "The observer's raw 10g + s." }),
  }),
  k: kHistorySchema.shape.data,
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
  ["Instrument", instrumentViewSchema],
  ["InstrumentList", instrumentListSchema],
  ["Tracing", tracingViewSchema],
  ["TracingSaved", tracingSavedSchema],
  ["Photo", photoViewSchema],
  ["Job", jobSchema],
  ["KSettingsView", kSettingsViewSchema],
  ["ReferenceSeries", referenceSeriesViewSchema],
  ["ReferenceSeriesList", referenceSeriesListSchema],
  ["ReviewQueuePage", reviewQueuePageSchema],
  ["ReviewDecisionResult", reviewDecisionResultSchema],
  ["DecisionLogPage", decisionLogPageSchema],
  ["ChartSeries", chartSeriesSchema],
  ["GroupLatitudes", groupLatitudesSchema],
  ["ObserverChart", observerChartSchema],
];
