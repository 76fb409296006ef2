import { z } from "zod";

import { FIELD_LABELS, HEMISPHERE_FIELDS, IMPORT_FIELDS, type ImportField } from "@/lib/import/columns";
import { DATE_FORMAT_IDS, isValidTimeZone } from "@/lib/import/dates";
import { DELIMITER_NAMES } from "@/lib/import/sniff";

import { optionalWholeNumber } from "./fields";

/** Larger than any real logbook (100,000 lines with notes is about 10 MB); anything bigger is refused unread. */
export const MAX_IMPORT_BYTES = 32 * 1024 * 1024;
export const MAX_IMPORT_COLUMNS = 200;
/** The report lists this many bad rows in full and counts the rest. */
export const MAX_REPORTED_PROBLEMS = 1000;

const column = (field: ImportField) =>
  optionalWholeNumber({
    label: `the column of ${FIELD_LABELS[field].toLowerCase()}`,
    min: 1,
    max: MAX_IMPORT_COLUMNS,
  });

/**
 * How to read one CSV logbook: which column holds what (numbered from 1),
 * the date format and the time zone, chosen once for the whole file. The
 * import form and POST /api/v1/imports (as query parameters) share it.
 */
export const importOptionsSchema = z
  .strictObject(
    {
      observerId: z.string().trim().min(1).max(64).optional(),
      fileName: z
        .string()
        .trim()
        .min(1)
        .max(200, { error: "The file name can be at most 200 characters." })
        .default("logbook.csv"),
      delimiter: z
        .enum(DELIMITER_NAMES, { error: "delimiter is comma, semicolon, tab or pipe." })
        .default("comma"),
      header: z
        .enum(["true", "false"], { error: "header is true (the first line names the columns) or false." })
        .default("true")
        .transform((v) => v === "true"),
      date: column("date"),
      time: column("time"),
      groups: column("groups"),
      spots: column("spots"),
      northGroups: column("northGroups"),
      northSpots: column("northSpots"),
      southGroups: column("southGroups"),
      southSpots: column("southSpots"),
      seeing: column("seeing"),
      instrument: column("instrument"),
      notes: column("notes"),
      dateFormat: z.enum(DATE_FORMAT_IDS, { error: "Choose how the dates are written." }),
      timeZone: z
        .string({ error: "Choose the time zone of the times in the file." })
        .trim()
        .refine(isValidTimeZone, { error: "That is not a time zone we know, e.g. Europe/London or UTC." })
        .default("UTC"),
      defaultTime: z
        .string()
        .regex(/^([01]\d|2[0-3]):[0-5]\d$/, { error: "Give the usual observing time as HH:MM, e.g. 10:00." })
        .default("12:00"),
      defaultSeeing: optionalWholeNumber({ label: "the seeing to assume", min: 1, max: 5 }),
      instrumentId: z.string().trim().min(1).max(64).optional(),
    },
    {
      error: (issue) =>
        issue.code === "unrecognized_keys" ? `Unknown option: ${issue.keys.join(", ")}.` : undefined,
    },
  )
  .superRefine((value, ctx) => {
    for (const field of ["date", "groups", "spots"] as const) {
      if (value[field] === undefined) {
        ctx.addIssue({
          code: "custom",
          path: [field],
          message: `Choose the column that holds ${FIELD_LABELS[field].toLowerCase()}.`,
        });
      }
    }
    const hemispheres = HEMISPHERE_FIELDS.filter((f) => value[f] !== undefined).length;
    if (hemispheres > 0 && hemispheres < 4) {
      for (const f of HEMISPHERE_FIELDS) {
        if (value[f] === undefined) {
          ctx.addIssue({
            code: "custom",
            path: [f],
            message: "Choose all four hemisphere columns, or none.",
          });
        }
      }
    }
    const used = new Map<number, ImportField>();
    for (const field of IMPORT_FIELDS) {
      const n = value[field];
      if (n === undefined) continue;
      const other = used.get(n);
      if (other) {
        ctx.addIssue({
          code: "custom",
          path: [field],
          message: `Column ${n} is already read as ${FIELD_LABELS[other].toLowerCase()}.`,
        });
      } else used.set(n, field);
    }
    if (value.seeing === undefined && value.defaultSeeing === undefined) {
      ctx.addIssue({
        code: "custom",
        path: ["defaultSeeing"],
        message: "The file has no seeing column: choose the seeing to assume.",
      });
    }
    if (value.instrument === undefined && value.instrumentId === undefined) {
      ctx.addIssue({
        code: "custom",
        path: ["instrumentId"],
        message: "The file has no instrument column: choose the instrument used.",
      });
    }
  });

export type ImportOptionsInput = z.input<typeof importOptionsSchema>;
export type ImportOptions = z.output<typeof importOptionsSchema>;
