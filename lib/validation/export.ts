import { z } from "zod";

const queryError = (issue: { code: string; keys?: string[] }) =>
  issue.code === "unrecognized_keys" ? `Unknown query parameter: ${issue.keys?.join(", ")}.` : undefined;

/** Query string of GET /api/v1/exports/logbook. */
export const logbookExportQuerySchema = z.strictObject(
  {
    format: z.enum(["csv", "json"], { error: "format is csv or json." }).default("csv"),
    observerId: z.string().trim().min(1).max(64).optional(),
  },
  { error: queryError },
);

/** Query string of GET /api/v1/exports/network. */
export const networkExportQuerySchema = z.strictObject(
  { format: z.enum(["csv", "json"], { error: "format is csv or json." }).default("csv") },
  { error: queryError },
);

/** Path of GET /api/v1/observers/{id}/k: an observer id, or "me". */
export const observerPathSchema = z.strictObject({
  id: z.string().trim().min(1).max(64).describe('An observer id, or "me" for the caller.'),
});
