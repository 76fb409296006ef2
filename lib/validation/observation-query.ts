import { z } from "zod";

const isoDay = z
  .string()
  .regex(/^\d{4}-\d{2}-\d{2}$/, { error: "Use a date like 2026-03-14." })
  .refine((d) => !Number.isNaN(Date.parse(`${d}T00:00:00Z`)), { error: "That is not a calendar date." });

/** Query string of GET /api/v1/observations; shared by the Logbook table. */
export const observationListQuerySchema = z
  .strictObject(
    {
      page: z.coerce
        .number({ error: "page must be a number." })
        .int()
        .min(1, { error: "page starts at 1." })
        .default(1),
      pageSize: z.coerce
        .number({ error: "pageSize must be a number." })
        .int()
        .min(1, { error: "pageSize must be at least 1." })
        .max(100, { error: "pageSize can be at most 100." })
        .default(25),
      sort: z
        .enum(["observedAt:desc", "observedAt:asc"], { error: "sort is observedAt:desc or observedAt:asc." })
        .default("observedAt:desc"),
      from: isoDay.optional(),
      to: isoDay.optional(),
    },
    {
      error: (issue) =>
        issue.code === "unrecognized_keys" ? `Unknown query parameter: ${issue.keys.join(", ")}.` : undefined,
    },
  )
  .refine((q) => !q.from || !q.to || q.from <= q.to, {
    path: ["to"],
    error: "'to' must not be before 'from'.",
  });

export type ObservationListQueryInput = z.output<typeof observationListQuerySchema>;
