import { z } from "zod";

/**
 * The planner's own settings, beside the instrument's fields: the day to plan
 * for and, for mirrors, the blur the suggested mask should aim at.
 */
export const plannerSettingsSchema = z.object({
  date: z
    .string({ error: "Choose a date." })
    .regex(/^\d{4}-\d{2}-\d{2}$/, { error: "Choose a date (YYYY-MM-DD)." })
    // Date.parse rolls 31 April over to 1 May; a round trip catches it.
    .refine((text) => toNoonUt(text)?.toISOString().slice(0, 10) === text, {
      error: "That date does not exist.",
    })
    .refine((text) => text >= "1900-01-01" && text <= "2100-12-31", {
      error: "Plan for a date between 1900 and 2100.",
    })
    // Noon UT: the middle of an observing day for most of the network.
    .transform((text) => toNoonUt(text) ?? new Date(Number.NaN)),
  targetBlurPercent: z.preprocess(
    (value) => (typeof value === "string" && value.trim() === "" ? undefined : value),
    z.coerce
      .number({ error: "Enter the blur to aim for, as a percentage of the disk." })
      .min(0.5, { error: "Aim for at least 0.5 % of the disk; finer than that no mirror delivers." })
      .max(30, { error: "A blur over 30 % of the disk hides every spot; aim lower." }),
  ),
});

export type PlannerSettings = z.infer<typeof plannerSettingsSchema>;

function toNoonUt(text: string): Date | null {
  const at = new Date(`${text}T12:00:00Z`);
  return Number.isNaN(at.getTime()) ? null : at;
}
