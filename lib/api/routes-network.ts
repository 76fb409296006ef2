/**
 * The routes behind the coordinator's and educator's screens (Review desk,
 * Archive charts, k settings, recompute jobs, the term table) and the
 * printable disk template. Spread into API_ROUTES (routes.ts).
 */
import { z } from "zod";

import { ROLES } from "@/lib/auth/roles";
import { DEFAULT_TEMPLATE_DIAMETER_MM } from "@/lib/tracer/template-svg";
import { termExportQuerySchema } from "@/lib/validation/classroom";
import { diskTemplateQuerySchema } from "@/lib/validation/disk-template";
import { decisionLogQuerySchema, reviewQueueQuerySchema } from "@/lib/validation/review";
import { observerChartQuerySchema } from "@/lib/validation/series-query";

import type { ApiRoute } from "./routes";
import {
  chartSeriesSchema,
  decisionLogPageSchema,
  groupLatitudesSchema,
  jobSchema,
  kSettingsViewSchema,
  observerChartSchema,
  referenceSeriesListSchema,
  reviewQueuePageSchema,
} from "./schemas";

export const REVIEW_QUEUE_ROUTE: ApiRoute = {
  operationId: "listReviewQueue",
  method: "get",
  path: "/api/v1/review/queue",
  tag: "Review desk",
  summary: "The Review desk's queue (coordinators)",
  description:
    "Observations waiting in one tab (submitted or queried), a page at a time, each with the observer's k, the scaled count, the day's network median and any automatic flags, plus how many wait in each tab.",
  roles: ["coordinator"],
  scope: "read",
  query: reviewQueueQuerySchema,
  notes: {
    status: "The tab: submitted (awaiting review) or queried.",
    from: "First UT day to include.",
    to: "Last UT day to include.",
    observerId: "Only this observer's counts.",
    flag: "any (flagged), none (unflagged) or one flag reason.",
  },
  responses: { 200: { description: "A page of the queue.", schema: reviewQueuePageSchema } },
  example: { query: { status: "submitted", flag: "any", sort: "observedAt:asc" } },
};

/** GET /api/v1/review/decisions, beside the POST in routes.ts. */
export const DECISION_LOG_ROUTE: ApiRoute = {
  operationId: "listDecisionLog",
  method: "get",
  path: "/api/v1/review/decisions",
  tag: "Review desk",
  summary: "The Decision log: every review decision (coordinators)",
  description:
    "Every line of the audit trail across the network, newest first unless asked otherwise: who decided, when, what and why, on which observation, with the observation's status now.",
  roles: ["coordinator"],
  scope: "read",
  query: decisionLogQuerySchema,
  notes: {
    action: "Only this kind of decision.",
    from: "First UT day of the decisions to include.",
    to: "Last UT day of the decisions to include.",
    observerId: "Only decisions on this observer's counts.",
    actorUserId: "Only decisions taken by this user.",
    format: "json (a page) or csv (every matching line, ignoring page and pageSize).",
  },
  responses: {
    200: {
      description: "A page of the log. With format=csv, every matching line as a download.",
      schema: decisionLogPageSchema,
      otherTypes: [{ contentType: "text/csv", description: "A header line, then one line per decision." }],
    },
  },
  example: { query: { action: "rejected", sort: "decidedAt:desc" } },
};

/** GET /api/v1/k-settings, beside the PUT in routes.ts. */
export const K_SETTINGS_READ_ROUTE: ApiRoute = {
  operationId: "getKSettings",
  method: "get",
  path: "/api/v1/k-settings",
  tag: "Series and k",
  summary: "How k is computed (coordinators)",
  description: "The current k settings, as the k settings form shows them.",
  roles: ["coordinator"],
  scope: "read",
  responses: { 200: { description: "The settings.", schema: kSettingsViewSchema } },
  example: {},
};

/** GET /api/v1/reference-series, beside the POST in routes.ts. */
export const REFERENCE_SERIES_LIST_ROUTE: ApiRoute = {
  operationId: "listReferenceSeries",
  method: "get",
  path: "/api/v1/reference-series",
  tag: "Series and k",
  summary: "Imported reference series (coordinators)",
  description: "Every imported reference series with its licence, source and range, newest first.",
  roles: ["coordinator"],
  scope: "read",
  responses: { 200: { description: "The series.", schema: referenceSeriesListSchema } },
  example: {},
};

export const SERIES_EXTRA_ROUTES: ApiRoute[] = [
  {
    operationId: "getArchiveChart",
    method: "get",
    path: "/api/v1/series/chart",
    tag: "Series and k",
    summary: "Every value of the series, for charts",
    description:
      "The whole daily index and the monthly means with their 13-month smoothed values, overall and for each hemisphere, as parallel arrays on one time axis (what the Archive charts draw).",
    roles: ROLES,
    scope: "read",
    responses: { 200: { description: "The chart data.", schema: chartSeriesSchema } },
    example: {},
  },
  {
    operationId: "getGroupLatitudes",
    method: "get",
    path: "/api/v1/series/latitudes",
    tag: "Series and k",
    summary: "Group latitudes over time",
    description:
      "The heliographic latitude of every group measured with the Disk tracer on an accepted count, in day order (the latitude–time diagram).",
    roles: ROLES,
    scope: "read",
    responses: { 200: { description: "The latitudes.", schema: groupLatitudesSchema } },
    example: {},
  },
  {
    operationId: "getObserverAgainstNetwork",
    method: "get",
    path: "/api/v1/series/observer",
    tag: "Series and k",
    summary: "An observer's counts against the network",
    description:
      "An observer's accepted counts scaled by their k, beside the network's daily index on the same days, with their k history. Coordinators name anyone with observerId; everyone else sees only themselves (another observer answers 404).",
    roles: ROLES,
    scope: "read",
    query: observerChartQuerySchema,
    responses: { 200: { description: "The observer's points and k.", schema: observerChartSchema } },
    example: { query: { observerId: "<observer id>" } },
  },
  {
    operationId: "startRecompute",
    method: "post",
    path: "/api/v1/series/recompute",
    tag: "Series and k",
    summary: "Recompute every k and the whole series (coordinators)",
    description:
      "Starts a full recompute in the background with the current k settings; follow it at the job's address. While one is queued or running, answers 200 with that one instead of starting another.",
    roles: ["coordinator"],
    scope: "read-submit",
    idempotent: true,
    responses: {
      202: {
        description: "Started.",
        schema: jobSchema,
        headers: { Location: "The job's address, /api/v1/jobs/{id}." },
      },
      200: {
        description: "One was already queued or running; this is that one.",
        schema: jobSchema,
        headers: { Location: "The job's address, /api/v1/jobs/{id}." },
      },
    },
    example: {},
  },
  {
    operationId: "getJob",
    method: "get",
    path: "/api/v1/jobs/{id}",
    tag: "Series and k",
    summary: "A background job's progress (coordinators)",
    description:
      "Status (queued, running, done or failed) and progress from 0 to 1 of a recompute or of the flags of a large import.",
    roles: ["coordinator"],
    scope: "read",
    pathParams: z.object({ id: z.string().min(1).describe("The job's id.") }),
    responses: { 200: { description: "The job.", schema: jobSchema } },
    example: { pathParams: { id: "<job id>" } },
  },
];

export const TERM_TABLE_ROUTE: ApiRoute = {
  operationId: "downloadTermTable",
  method: "get",
  path: "/api/v1/classrooms/{id}/term",
  tag: "Classrooms",
  summary: "Download a classroom's term table (educators)",
  description:
    "What the Term comparison page shows for one of your classrooms, as CSV: for each student the sessions counted, k against the class with its uncertainty, after how many sessions it settled, and 10g + s for every session. Someone else's classroom answers 404.",
  roles: ["educator"],
  scope: "read",
  pathParams: z.object({ id: z.string().min(1).describe("The classroom's id.") }),
  query: termExportQuerySchema,
  notes: { method: "How each student's k is fitted." },
  responses: {
    200: {
      description: "The table, as an attachment.",
      otherTypes: [{ contentType: "text/csv", description: "A header line, then one line per student." }],
    },
  },
  curlSave: "-OJ",
  example: { pathParams: { id: "<classroom id>" }, query: { method: "median-of-ratios" } },
};

export const DISK_TEMPLATE_ROUTE: ApiRoute = {
  operationId: "getDiskTemplate",
  method: "get",
  path: "/api/v1/disk-template",
  tag: "The Sun",
  summary: "A printable disk template",
  description:
    "An A4 sheet as SVG at true size (print at 100 %): the limb circle with the heliographic grid for the instant (turned by P, tilted by B0), the N–S and E–W marks and boxes for the day's notes, to tape to the projection screen and draw on.",
  roles: ROLES,
  scope: "read",
  query: diskTemplateQuerySchema,
  alsoOptional: ["diameterMm"],
  notes: {
    date: "The UT day, YYYY-MM-DD.",
    time: "The UT time of day, HH:MM.",
    diameterMm: `The disk's diameter on paper, millimetres (${DEFAULT_TEMPLATE_DIAMETER_MM} when left out).`,
    mirrored: "true for a mirror-reversed sheet (west on the left).",
  },
  responses: {
    200: {
      description: "The template.",
      otherTypes: [{ contentType: "image/svg+xml", description: "The SVG, at true size." }],
    },
  },
  curlSave: "-OJ",
  example: { query: { date: "2026-03-14", time: "09:30", diameterMm: "150" } },
};
