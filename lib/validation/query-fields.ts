import { z } from "zod";

/**
 * Pieces every list endpoint's query string shares: a UT day, page and page
 * size, the message for a parameter nobody reads, and a from/to range that
 * must not run backwards.
 */
export const queryDay = z
  .string()
  .regex(/^\d{4}-\d{2}-\d{2}$/, { error: "Use a date like 2026-03-14." })
  .refine((d) => !Number.isNaN(Date.parse(`${d}T00:00:00Z`)), { error: "That is not a calendar date." });

export function pagingFields({ defaultSize, maxSize }: { defaultSize: number; maxSize: number }) {
  return {
    page: z.coerce
      .number({ error: "page must be a number." })
      .int()
      .min(1, { error: "page starts at 1." })
      .default(1),
    pageSize: z.coerce
      .number({ error: "pageSize must be a number." })
      .int()
      .min(1, { error: "pageSize must be at least 1." })
      .max(maxSize, { error: `pageSize can be at most ${maxSize}.` })
      .default(defaultSize),
  };
}

/** The strictObject error for query strings: names the parameters nobody reads. */
export const unknownQueryParameter = (issue: { code: string; keys?: string[] }) =>
  issue.code === "unrecognized_keys" ? `Unknown query parameter: ${issue.keys?.join(", ")}.` : undefined;

/** For .refine(fromNotAfterTo, RANGE_ORDER_ISSUE): ISO text compares in time order. */
export const fromNotAfterTo = (q: { from?: string; to?: string }) => !q.from || !q.to || q.from <= q.to;
export const RANGE_ORDER_ISSUE = { path: ["to"], error: "'to' must not be before 'from'." };
