import { z } from "zod";

import { UNIT_SYSTEMS } from "@/lib/optics/units";

/** The observer's choice of units for instrument forms and the planner. */
export const unitPreferenceSchema = z.object({
  unitSystem: z.enum(UNIT_SYSTEMS, { error: "Choose metric or imperial units." }),
});

export type UnitPreference = z.infer<typeof unitPreferenceSchema>;
