import { z } from "zod";

import type { ReviewAction } from "@/db/schema";
import { FLAG_REASON_LIST } from "@/lib/review/flag-labels";

import { capitalise } from "./fields";
import {
  pagingFields,
  queryDay,
  fromNotAfterTo,
  RANGE_ORDER_ISSUE,
  unknownQueryParameter,
} from "./query-fields";

/** What a coordinator can do to an observation from the Review desk. */
export const REVIEW_DECISION_ACTIONS = ["accept", "query", "reject", "reopen"] as const;
export type ReviewDecisionAction = (typeof REVIEW_DECISION_ACTIONS)[number];

/** Bulk decisions are bounded so one request cannot hold the write lock for long. */
export const MAX_DECISION_IDS = 200;
export const MAX_NOTE_LENGTH = 2000;

const observationId = z
  .string({ error: "Each observation id must be text." })
  .trim()
  .min(1, { error: "An observation id is empty." })
  .max(64, { error: "That is not an observation id." });

/**
 * The one schema for a review decision, shared by the Review desk forms and
 * POST /api/v1/review/decisions. A note is optional when accepting; a query,
 * a rejection or a reopening must say why, because the observer (or the next
 * coordinator reading the audit trail) is owed the reason.
 */
export const reviewDecisionSchema = z
  .strictObject(
    {
      action: z.enum(REVIEW_DECISION_ACTIONS, { error: "Choose accept, query, reject or reopen." }),
      observationIds: z
        .array(observationId, { error: "Choose at least one observation." })
        .min(1, { error: "Choose at least one observation." })
        .max(MAX_DECISION_IDS, { error: `Decide at most ${MAX_DECISION_IDS} observations at a time.` })
        // A double-ticked row must not become two decisions on one observation.
        .transform((ids) => [...new Set(ids)]),
      note: z.preprocess(
        (v) =>
          typeof v === "string" ? (v.trim() === "" ? undefined : v.trim()) : v === null ? undefined : v,
        z
          .string({ error: "The note must be text." })
          .max(MAX_NOTE_LENGTH, { error: `The note can be at most ${MAX_NOTE_LENGTH} characters.` })
          .optional(),
      ),
    },
    {
      error: (issue) =>
        issue.code === "unrecognized_keys" ? `Unknown field: ${issue.keys.join(", ")}.` : undefined,
    },
  )
  .superRefine((value, ctx) => {
    if (value.action !== "accept" && value.note === undefined) {
      const why = {
        query: "Write the question the observer should answer.",
        reject: "Say why the count is not used; the observer reads this note.",
        reopen: "Say why the decision is reopened; the note stays in the audit trail.",
      }[value.action];
      ctx.addIssue({ code: "custom", path: ["note"], message: why });
    }
  });

export type ReviewDecisionInput = z.output<typeof reviewDecisionSchema>;

export const REVIEW_QUEUE_SORTS = [
  "observedAt:desc",
  "observedAt:asc",
  "receivedAt:desc",
  "receivedAt:asc",
  "observer:asc",
  "observer:desc",
] as const;
export type ReviewQueueSort = (typeof REVIEW_QUEUE_SORTS)[number];

/** Filter on automatic flags: any flag, none, or one reason. */
export const REVIEW_FLAG_FILTERS = ["any", "none", ...FLAG_REASON_LIST] as const;

/** Query string of GET /api/v1/review/queue; shared by the Review desk table. */
export const reviewQueueQuerySchema = z
  .strictObject(
    {
      status: z
        .enum(["submitted", "queried"], { error: "status is submitted or queried." })
        .default("submitted"),
      ...pagingFields({ defaultSize: 25, maxSize: 100 }),
      sort: z
        .enum(REVIEW_QUEUE_SORTS, { error: `sort is one of ${REVIEW_QUEUE_SORTS.join(", ")}.` })
        .default("receivedAt:desc"),
      from: queryDay.optional(),
      to: queryDay.optional(),
      observerId: z.string().trim().min(1).max(64, { error: "That is not an observer id." }).optional(),
      flag: z
        .enum(REVIEW_FLAG_FILTERS, { error: `flag is one of ${REVIEW_FLAG_FILTERS.join(", ")}.` })
        .optional(),
    },
    { error: unknownQueryParameter },
  )
  .refine(fromNotAfterTo, RANGE_ORDER_ISSUE);

export type ReviewQueueQueryInput = z.output<typeof reviewQueueQuerySchema>;

/** Every kind of line in the audit trail (the same list as the database's), for the Decision log's filter. */
export const DECISION_LOG_ACTIONS = [
  "accepted",
  "queried",
  "rejected",
  "resubmitted",
  "reopened",
] as const satisfies readonly ReviewAction[];

export const DECISION_LOG_SORTS = ["decidedAt:desc", "decidedAt:asc"] as const;

/** Query string of GET /api/v1/review/decisions; shared by the Decision log table. */
export const decisionLogQuerySchema = z
  .strictObject(
    {
      ...pagingFields({ defaultSize: 25, maxSize: 100 }),
      sort: z
        .enum(DECISION_LOG_SORTS, { error: `sort is one of ${DECISION_LOG_SORTS.join(", ")}.` })
        .default("decidedAt:desc"),
      action: z
        .enum(DECISION_LOG_ACTIONS, { error: `action is one of ${DECISION_LOG_ACTIONS.join(", ")}.` })
        .optional(),
      /** First and last UT day of the decisions (not of the observations). */
      from: queryDay.optional(),
      to: queryDay.optional(),
      observerId: z.string().trim().min(1).max(64, { error: "That is not an observer id." }).optional(),
      actorUserId: z.string().trim().min(1).max(64, { error: "That is not a user id." }).optional(),
      /** csv: every matching line as a download, ignoring page and pageSize. */
      format: z.enum(["json", "csv"], { error: "format is json or csv." }).default("json"),
    },
    { error: unknownQueryParameter },
  )
  .refine(fromNotAfterTo, RANGE_ORDER_ISSUE);

export type DecisionLogQueryInput = z.output<typeof decisionLogQuerySchema>;

/** Bounds on the outlier threshold: below 2 almost every busy day is flagged, above 10 almost nothing is. */
export const OUTLIER_THRESHOLD_MIN = 2;
export const OUTLIER_THRESHOLD_MAX = 10;

const toNumber = (value: unknown) =>
  typeof value === "string" ? (value.trim() === "" ? undefined : Number(value.trim())) : value;

/** The Review desk's settings form (and the server action behind it). */
export const reviewSettingsSchema = z.strictObject({
  outlierThreshold: z.preprocess(
    toNumber,
    z
      .number({
        error: (issue) =>
          issue.input === undefined
            ? "Enter a threshold."
            : `${capitalise("the threshold")} must be a number.`,
      })
      .refine(Number.isFinite, { error: "The threshold must be a number." })
      .min(OUTLIER_THRESHOLD_MIN, { error: `The threshold must be at least ${OUTLIER_THRESHOLD_MIN}.` })
      .max(OUTLIER_THRESHOLD_MAX, { error: `The threshold can be at most ${OUTLIER_THRESHOLD_MAX}.` }),
  ),
});

export type ReviewSettingsInput = z.output<typeof reviewSettingsSchema>;
