/**
 * Every documented /api/v1 route, described once. Query and body schemas are
 * the very ones the route handlers parse with; lib/api/openapi.ts turns this
 * list into the OpenAPI document and the /api-docs page renders it.
 */
import { z } from "zod";

import type { Role } from "@/lib/auth/roles";
import { importOptionsSchema } from "@/lib/validation/import";
import { kSettingsSchema } from "@/lib/validation/k-settings";
import { referenceImportSchema } from "@/lib/validation/reference-import";
import { reviewDecisionSchema } from "@/lib/validation/review";
import {
  logbookExportQuerySchema,
  networkExportQuerySchema,
  observerPathSchema,
} from "@/lib/validation/export";
import { observationInputSchema } from "@/lib/validation/observation";
import { observationListQuerySchema } from "@/lib/validation/observation-query";
import { seriesQuerySchema } from "@/lib/validation/series-query";
import { solarOrientationQuerySchema } from "@/lib/validation/tracing";

import {
  CLASS_SESSION_COUNT_ROUTE,
  INSTRUMENT_ROUTES,
  OBSERVATION_DELETE_ROUTE,
  TRACING_AND_PHOTO_ROUTES,
} from "./routes-logbook";
import {
  DECISION_LOG_ROUTE,
  DISK_TEMPLATE_ROUTE,
  K_SETTINGS_READ_ROUTE,
  REFERENCE_SERIES_LIST_ROUTE,
  REVIEW_QUEUE_ROUTE,
  SERIES_EXTRA_ROUTES,
  TERM_TABLE_ROUTE,
} from "./routes-network";
import {
  dailySeriesPageSchema,
  errorBodySchema,
  importResultSchema,
  kHistorySchema,
  kSettingsViewSchema,
  monthlySeriesPageSchema,
  observationPageSchema,
  observationViewSchema,
  referenceSeriesViewSchema,
  reviewDecisionResultSchema,
  solarOrientationSchema,
  yearlySeriesPageSchema,
} from "./schemas";

export type ApiTag =
  | "Observations"
  | "Instruments"
  | "Tracings and photos"
  | "Imports and exports"
  | "Review desk"
  | "Series and k"
  | "Classrooms"
  | "The Sun"
  | "Reference";

export type ApiResponse = {
  description: string;
  /** A JSON body described by a zod schema. */
  schema?: z.ZodType;
  /** Other media types the same status can answer with (CSV, NDJSON...). */
  otherTypes?: Array<{ contentType: string; description: string }>;
  headers?: Record<string, string>;
};

export type ApiRoute = {
  operationId: string;
  method: "get" | "post" | "put" | "delete";
  path: string;
  tag: ApiTag;
  summary: string;
  description: string;
  /** Who may call it (admins pass wherever coordinators do). Empty: anyone, signed in or not. */
  roles: readonly Role[];
  /** The API token scope needed; "session" means a signed-in browser only. */
  scope: "read" | "read-submit" | "session" | "none";
  pathParams?: z.ZodType;
  query?: z.ZodType;
  body?: { schema?: z.ZodType; contentType: string; description: string; name?: string };
  /** Writes accept Idempotency-Key. */
  idempotent?: boolean;
  /** How the curl example saves a file answer (e.g. "-OJ", "-o tracing.png"). */
  curlSave?: string;
  responses: Record<number, ApiResponse>;
  /** Parameters a cross-field rule makes required though the schema alone lets them be left out. */
  alsoRequired?: string[];
  /** Parameters a preprocess step fills in when left out, though the converted schema calls them required. */
  alsoOptional?: string[];
  /** Words for parameters and body fields, beside FIELD_NOTES (these win). */
  notes?: Record<string, string>;
  example: {
    pathParams?: Record<string, string>;
    query?: Record<string, string>;
    body?: unknown;
    bodyText?: string;
  };
};

/** What each parameter or body field means, wherever it appears. */
export const FIELD_NOTES: Record<string, string> = {
  observedAt:
    "When you observed, as an ISO 8601 instant with Z or an offset. Not in the future, not before 1610.",
  seeing: "Seeing from 1 (excellent) to 5 (very poor).",
  instrumentId: "One of your instruments (GET your Logbook or open Instruments to find its id).",
  groups: "Sunspot groups g.",
  spots: "Individual spots s (at least one per group).",
  northGroups: "Groups in the northern hemisphere (give all four hemisphere counts, or none).",
  northSpots: "Spots in the northern hemisphere.",
  southGroups: "Groups in the southern hemisphere.",
  southSpots: "Spots in the southern hemisphere.",
  notes: "Free text, at most 2,000 characters.",
  page: "Page number, from 1.",
  pageSize: "Rows per page.",
  sort: "Column and direction.",
  from: "First day (or month, year) to include.",
  to: "Last day (or month, year) to include.",
  hemisphere: "all, N (northern) or S (southern).",
  format: "The file or answer format.",
  observerId: "For coordinators: whose data. Everyone else leaves it out (their own).",
  at: "The instant, ISO 8601 (e.g. 2026-03-14T09:30:00Z), between 1600 and 2200.",
  id: "The id from the path.",
};

const IMPORT_NOTES: Record<string, string> = {
  observerId: "Coordinators: the observer whose logbook this is. Observers leave it out.",
  fileName: "The file's name, kept with the import for the record.",
  delimiter: "What separates the values on a line.",
  header: "Whether the first line names the columns (it is then skipped).",
  date: "Column number (from 1) of the date, or of the date and time.",
  time: "Column number of the time of day, if the file has one.",
  groups: "Column number of the groups g.",
  spots: "Column number of the spots s.",
  northGroups: "Column number of the northern groups (all four hemisphere columns, or none).",
  northSpots: "Column number of the northern spots.",
  southGroups: "Column number of the southern groups.",
  southSpots: "Column number of the southern spots.",
  seeing: "Column number of the seeing (1–5).",
  instrument: "Column number of the instrument's name (as in your Instruments list).",
  notes: "Column number of the notes.",
  dateFormat: "How the dates are written.",
  timeZone:
    "IANA time zone of the dates and times (e.g. Europe/London); an ISO time with Z or an offset wins.",
  defaultTime: "Time of day (HH:MM, in the time zone) for lines that give only a date.",
  defaultSeeing: "Seeing to record when the file has no seeing column (or the cell is empty).",
  instrumentId: "The instrument used, when the file has no instrument column.",
};

/** The observation routes take the id from the path as it is (someone else's id answers 404). */
const observationPathSchema = z.object({ id: z.string().min(1).describe("The observation's id.") });

const OBSERVER_ROLES = ["observer", "student"] as const satisfies readonly Role[];
const EVERY_ROLE = [
  "observer",
  "student",
  "coordinator",
  "educator",
  "admin",
] as const satisfies readonly Role[];

const exampleObservation = {
  observedAt: "2026-03-14T09:30:00Z",
  seeing: 2,
  instrumentId: "<instrument id>",
  groups: 3,
  spots: 17,
  northGroups: 2,
  northSpots: 11,
  southGroups: 1,
  southSpots: 6,
  notes: "Thin cirrus to the west",
};

const seriesRoute = (
  kind: "daily" | "monthly" | "yearly",
  schema: z.ZodType,
  example: Record<string, string>,
): ApiRoute => ({
  operationId: `getSeries${kind[0]!.toUpperCase()}${kind.slice(1)}`,
  method: "get",
  path: `/api/v1/series/${kind}`,
  tag: "Series and k",
  summary: `The published ${kind} series`,
  description:
    kind === "monthly"
      ? "Monthly means of the network's daily index with the 13-month smoothed mean, for all groups or one hemisphere, over an inclusive range of months."
      : kind === "daily"
        ? "The network's daily index (mean of k(10g + s) over the day's accepted counts, with the number of observers and the spread), overall or for one hemisphere, over an inclusive range of days."
        : "Yearly means of the daily index, overall or for one hemisphere.",
  roles: EVERY_ROLE,
  scope: "read",
  query: seriesQuerySchema(kind),
  responses: {
    200: {
      description:
        "A page of the series. With format=csv (or the path ending .csv) the whole filtered range as CSV.",
      schema,
      otherTypes: [{ contentType: "text/csv", description: "The whole filtered range, oldest first." }],
    },
  },
  example: { query: example },
});

export const API_ROUTES: ApiRoute[] = [
  {
    operationId: "listObservations",
    method: "get",
    path: "/api/v1/observations",
    tag: "Observations",
    summary: "List your observations",
    description:
      "Your own Logbook, a page at a time, newest first unless asked otherwise; optionally between two UT dates.",
    roles: OBSERVER_ROLES,
    scope: "read",
    query: observationListQuerySchema,
    responses: {
      200: {
        description: "A page of observations with their relative numbers.",
        schema: observationPageSchema,
      },
    },
    example: { query: { from: "2026-01-01", to: "2026-03-31", pageSize: "50" } },
  },
  {
    operationId: "submitObservation",
    method: "post",
    path: "/api/v1/observations",
    tag: "Observations",
    summary: "Submit an observation",
    description:
      "Logs one count in your Logbook. It arrives on the coordinator's Review desk with status submitted. The instrument must be one of yours; hemisphere counts are all four or none and must add up.",
    roles: OBSERVER_ROLES,
    scope: "read-submit",
    body: {
      schema: observationInputSchema,
      contentType: "application/json",
      description: "The observation.",
      name: "ObservationInput",
    },
    idempotent: true,
    responses: {
      201: {
        description: "Stored; the answer is the observation as the Logbook shows it.",
        schema: observationViewSchema,
      },
    },
    example: { body: exampleObservation },
  },
  {
    operationId: "getObservation",
    method: "get",
    path: "/api/v1/observations/{id}",
    tag: "Observations",
    summary: "Fetch one of your observations",
    description: "Someone else's observation answers 404, exactly like a missing one.",
    roles: OBSERVER_ROLES,
    scope: "read",
    pathParams: observationPathSchema,
    responses: { 200: { description: "The observation.", schema: observationViewSchema } },
    example: { pathParams: { id: "<observation id>" } },
  },
  {
    operationId: "reviseObservation",
    method: "put",
    path: "/api/v1/observations/{id}",
    tag: "Observations",
    summary: "Correct one of your observations",
    description:
      "Replaces every value (send the whole observation again). A corrected count goes back to the Review desk. A student's class-session count keeps its session's instrument and time window and can be corrected only while the session is open (409 afterwards).",
    roles: OBSERVER_ROLES,
    scope: "read-submit",
    pathParams: observationPathSchema,
    body: {
      schema: observationInputSchema,
      contentType: "application/json",
      description: "The whole observation.",
      name: "ObservationInput",
    },
    idempotent: true,
    responses: { 200: { description: "The corrected observation.", schema: observationViewSchema } },
    example: { pathParams: { id: "<observation id>" }, body: exampleObservation },
  },
  OBSERVATION_DELETE_ROUTE,
  ...INSTRUMENT_ROUTES,
  ...TRACING_AND_PHOTO_ROUTES,
  {
    operationId: "importLogbook",
    method: "post",
    path: "/api/v1/imports",
    tag: "Imports and exports",
    summary: "Import a CSV logbook",
    description:
      "The CSV file is the request body; the query string says how to read it (columns numbered from 1, date format, time zone). Either every line is stored or none is: any bad line (bad or future date, counts that are not whole numbers or are negative, s < g, spots without groups, a repeated day and instrument, an unknown instrument) answers 400 with one issue per line. Lines imported before with the same content are skipped, so importing a file twice adds nothing twice. Coordinators import for an observer with observerId. With Accept: application/x-ndjson (and no Idempotency-Key) the answer streams progress lines and ends with the result.",
    roles: ["observer", "coordinator"],
    scope: "read-submit",
    query: importOptionsSchema,
    alsoRequired: ["date", "groups", "spots"],
    notes: IMPORT_NOTES,
    body: { contentType: "text/csv", description: "The logbook as UTF-8 CSV, at most 32 MB." },
    idempotent: true,
    responses: {
      201: {
        description: "Every line was stored (or had been before).",
        schema: importResultSchema,
        otherTypes: [
          {
            contentType: "application/x-ndjson",
            description:
              'With Accept: application/x-ndjson: status 200 and lines {"type":"progress",...} then {"type":"done","status":201,"result":{...}} or {"type":"failed","status":400,"error":{...}}.',
          },
        ],
      },
    },
    example: {
      query: {
        date: "1",
        groups: "2",
        spots: "3",
        notes: "4",
        dateFormat: "dd/mm/yyyy",
        timeZone: "Europe/London",
        defaultSeeing: "3",
        instrumentId: "<instrument id>",
      },
      bodyText: "date,g,s,notes\n14/03/2026,3,17,thin cirrus\n15/03/2026,0,0,\n",
    },
  },
  REVIEW_QUEUE_ROUTE,
  DECISION_LOG_ROUTE,
  {
    operationId: "decideObservations",
    method: "post",
    path: "/api/v1/review/decisions",
    tag: "Review desk",
    summary: "Accept, query, reject or reopen observations (coordinators)",
    description:
      "Decides one or many observations from the Review desk, all or none. A query, a rejection or a reopening must carry a note saying why; at most 200 observations at a time.",
    roles: ["coordinator"],
    scope: "read-submit",
    body: {
      schema: reviewDecisionSchema,
      contentType: "application/json",
      description: "The decision and the observations it applies to.",
      name: "ReviewDecision",
    },
    idempotent: true,
    responses: {
      200: { description: "Every observation was decided.", schema: reviewDecisionResultSchema },
      409: {
        description: "Some observations are not in a status this decision applies to; nothing was changed.",
        schema: errorBodySchema,
      },
    },
    example: { body: { action: "query", observationIds: ["<observation id>"], note: "Was the sky clear?" } },
  },
  {
    operationId: "exportLogbook",
    method: "get",
    path: "/api/v1/exports/logbook",
    tag: "Imports and exports",
    summary: "Download a complete Logbook",
    description:
      "Your whole Logbook (or, for coordinators, any observer's with observerId) as CSV, or as JSON with each observation's disk-tracer groups: number, spots, Zurich and McIntosh classes, heliographic latitude, central meridian distance, Carrington longitude and area in MSH. The CSV reads straight back into the import.",
    roles: ["observer", "student", "coordinator"],
    scope: "read",
    query: logbookExportQuerySchema,
    curlSave: "-OJ",
    responses: {
      200: {
        description: "The file, as an attachment.",
        otherTypes: [
          { contentType: "text/csv", description: "One line per observation, oldest first." },
          {
            contentType: "application/json",
            description: "The observer, their instruments and every observation with its groups.",
          },
        ],
      },
    },
    example: { query: { format: "json" } },
  },
  {
    operationId: "exportNetworkArchive",
    method: "get",
    path: "/api/v1/exports/network",
    tag: "Imports and exports",
    summary: "Download the whole network archive",
    description:
      "Every observer's every observation, whatever its review status, with observer codes. CSV or JSON.",
    roles: ["coordinator"],
    scope: "read",
    query: networkExportQuerySchema,
    curlSave: "-OJ",
    responses: {
      200: {
        description: "The file, as an attachment.",
        otherTypes: [
          { contentType: "text/csv", description: "One line per observation." },
          {
            contentType: "application/json",
            description: "Observers, instruments and observations with their groups.",
          },
        ],
      },
    },
    example: { query: { format: "csv" } },
  },
  seriesRoute("daily", dailySeriesPageSchema, {
    hemisphere: "N",
    from: "2025-01-01",
    to: "2025-12-31",
    sort: "day:asc",
    pageSize: "366",
  }),
  seriesRoute("monthly", monthlySeriesPageSchema, {
    hemisphere: "all",
    from: "2020-01",
    to: "2025-12",
    sort: "month:asc",
  }),
  seriesRoute("yearly", yearlySeriesPageSchema, { hemisphere: "S", format: "csv" }),
  {
    operationId: "getObserverK",
    method: "get",
    path: "/api/v1/observers/{id}/k",
    tag: "Series and k",
    summary: "An observer's k history",
    description:
      'Every k coefficient of an observer, for each instrument and period, with its uncertainty, the number of common days and the reference it was fitted against. Use "me" for yourself; coordinators may ask for anyone, everyone else only for themselves.',
    roles: EVERY_ROLE,
    scope: "read",
    pathParams: observerPathSchema,
    responses: { 200: { description: "The k history, oldest period first.", schema: kHistorySchema } },
    example: { pathParams: { id: "me" } },
  },
  ...SERIES_EXTRA_ROUTES,
  K_SETTINGS_READ_ROUTE,
  {
    operationId: "saveKSettings",
    method: "put",
    path: "/api/v1/k-settings",
    tag: "Series and k",
    summary: "Save how k is computed (coordinators)",
    description:
      "Replaces the whole set of k settings: period, method, minimum of common days, reference, pilot and drift threshold. They take effect at the next full recompute.",
    roles: ["coordinator"],
    scope: "read-submit",
    body: {
      schema: kSettingsSchema,
      contentType: "application/json",
      description: "Every k setting.",
      name: "KSettings",
    },
    idempotent: true,
    responses: { 200: { description: "The settings as saved.", schema: kSettingsViewSchema } },
    example: {
      body: {
        periodKind: "year",
        method: "ratio-of-sums",
        minCommonDays: 10,
        referenceSeriesId: "network",
        pilotObserverId: null,
        pilotK: 1,
        driftFraction: 0.1,
      },
    },
  },
  REFERENCE_SERIES_LIST_ROUTE,
  {
    operationId: "importReferenceSeries",
    method: "post",
    path: "/api/v1/reference-series",
    tag: "Series and k",
    summary: "Import a reference series (coordinators)",
    description:
      "The CSV text travels inside the JSON body: a header naming date and value, then one row per UT day. Any bad row refuses the whole file with 400 and one issue per row; nothing is stored half-way.",
    roles: ["coordinator"],
    scope: "read-submit",
    body: {
      schema: referenceImportSchema,
      contentType: "application/json",
      description: "The series' name, licence, optional source, and the CSV text (at most 5 MB).",
      name: "ReferenceImport",
    },
    idempotent: true,
    responses: { 201: { description: "The series was stored.", schema: referenceSeriesViewSchema } },
    example: {
      body: { name: "My reference", licence: "CC BY 4.0", csv: "date,value\n2026-03-14,42\n" },
    },
  },
  {
    operationId: "getSolarOrientation",
    method: "get",
    path: "/api/v1/solar-orientation",
    tag: "The Sun",
    summary: "The Sun's orientation at an instant",
    description:
      "Position angle P, B0 and L0 of the disk centre, the Carrington rotation number and the apparent semidiameter, from the IAU rotation model of the Sun (Archinal et al. 2011).",
    roles: EVERY_ROLE,
    scope: "read",
    query: solarOrientationQuerySchema,
    responses: { 200: { description: "The orientation.", schema: solarOrientationSchema } },
    example: { query: { at: "2026-03-14T09:30:00Z" } },
  },
  DISK_TEMPLATE_ROUTE,
  CLASS_SESSION_COUNT_ROUTE,
  TERM_TABLE_ROUTE,
  {
    operationId: "downloadSnapshot",
    method: "get",
    path: "/api/v1/admin/snapshot",
    tag: "Reference",
    summary: "Download a database snapshot (admins, signed in)",
    description:
      "A consistent copy of the whole embedded database, made with SQLite's VACUUM INTO. Only from a signed-in admin session (Admin → Backups): API tokens are refused.",
    roles: ["admin"],
    scope: "session",
    responses: {
      200: {
        description: "The SQLite file.",
        otherTypes: [{ contentType: "application/vnd.sqlite3", description: "The database file." }],
      },
    },
    curlSave: "-OJ",
    example: {},
  },
  {
    operationId: "getOpenApiDocument",
    method: "get",
    path: "/api/v1/openapi.json",
    tag: "Reference",
    summary: "This API, as OpenAPI 3.1",
    description:
      "The machine-readable description of every route on this page, generated from the schemas the routes validate with.",
    roles: [],
    scope: "none",
    responses: { 200: { description: "The OpenAPI 3.1 document." } },
    example: {},
  },
];

export const API_TAG_ORDER: ApiTag[] = [
  "Observations",
  "Instruments",
  "Tracings and photos",
  "Imports and exports",
  "Review desk",
  "Series and k",
  "Classrooms",
  "The Sun",
  "Reference",
];
