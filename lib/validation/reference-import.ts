import { z } from "zod";

import { parseReferenceCsv } from "@/lib/series/reference-csv";

import { capitalise, optionalText } from "./fields";

/** 5 MB holds several centuries of daily values; anything larger is not a daily series. */
export const MAX_REFERENCE_CSV_BYTES = 5 * 1024 * 1024;

function requiredText({ label, max }: { label: string; max: number }) {
  return z
    .string({ error: `Enter ${label}.` })
    .trim()
    .min(1, { error: `Enter ${label}.` })
    .max(max, { error: `${capitalise(label)} can be at most ${max} characters.` });
}

/**
 * A reference series upload, shared by the import form (which checks the file
 * before sending it) and POST /api/v1/reference-series. The CSV is parsed
 * here: every bad row becomes an issue at path ["csv", row] whose message
 * names the row and the reason, and a file with any issue is refused whole.
 */
export const referenceImportSchema = z
  .strictObject({
    name: requiredText({ label: "a name for the series", max: 120 }),
    licence: requiredText({ label: "the licence the values are published under", max: 200 }),
    source: optionalText({ label: "source", max: 300 }),
    csv: z
      .string({ error: "Choose a CSV file." })
      .min(1, { error: "Choose a CSV file." })
      .max(MAX_REFERENCE_CSV_BYTES, { error: "The file is larger than 5 MB; split it or remove columns." }),
  })
  .transform((input, ctx) => {
    const parsed = parseReferenceCsv(input.csv);
    if (!parsed.ok) {
      for (const problem of parsed.problems) {
        ctx.addIssue({
          code: "custom",
          path: ["csv", problem.row],
          message: `Row ${problem.row}: ${problem.reason}`,
        });
      }
      if (parsed.moreProblems > 0) {
        ctx.addIssue({
          code: "custom",
          path: ["csv"],
          message: `…and ${parsed.moreProblems} more problems.`,
        });
      }
      return z.NEVER;
    }
    return {
      name: input.name,
      licence: input.licence,
      source: input.source ?? null,
      values: parsed.values,
      firstDay: parsed.firstDay,
      lastDay: parsed.lastDay,
    };
  });

export type ReferenceImport = z.output<typeof referenceImportSchema>;
