import { z } from "zod";

import {
  DEFAULT_TEMPLATE_DIAMETER_MM,
  MAX_TEMPLATE_DIAMETER_MM,
  MIN_TEMPLATE_DIAMETER_MM,
} from "@/lib/tracer/template-svg";

/** Query of the printable disk template (page form and SVG route). Everything arrives as text. */
export const diskTemplateQuerySchema = z.object({
  date: z
    .string({ error: "Choose the date to print the template for." })
    .pipe(z.iso.date({ error: "Give the date as YYYY-MM-DD." }))
    .refine((d) => d >= "1600-01-01" && d <= "2200-12-31", { error: "Choose a date between 1600 and 2200." }),
  time: z
    .string()
    .regex(/^([01]\d|2[0-3]):[0-5]\d$/, { error: "Give the time (UT) as HH:MM, e.g. 09:30." })
    .default("12:00"),
  diameterMm: z.preprocess(
    (v) => (v === "" || v === undefined ? DEFAULT_TEMPLATE_DIAMETER_MM : v),
    z.coerce
      .number({ error: "The disk diameter must be a number of millimetres." })
      .refine(Number.isFinite, { error: "The disk diameter must be a number of millimetres." })
      .min(MIN_TEMPLATE_DIAMETER_MM, {
        error: `Make the disk at least ${MIN_TEMPLATE_DIAMETER_MM} mm across.`,
      })
      .max(MAX_TEMPLATE_DIAMETER_MM, {
        error: `A disk over ${MAX_TEMPLATE_DIAMETER_MM} mm does not fit a printable sheet.`,
      }),
  ),
  mirrored: z
    .enum(["true", "false", "1", "0", "on", ""], { error: "mirrored is true or false." })
    .optional()
    .transform((v) => v === "true" || v === "1" || v === "on"),
});

export type DiskTemplateQuery = z.output<typeof diskTemplateQuerySchema>;

export function templateInstant(query: Pick<DiskTemplateQuery, "date" | "time">): Date {
  return new Date(`${query.date}T${query.time}:00Z`);
}
