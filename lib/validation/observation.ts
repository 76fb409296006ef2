import { z } from "zod";

import { optionalText, optionalWholeNumber, wholeNumber } from "./fields";

/** Galileo and his contemporaries first turned telescopes on sunspots in 1610. */
export const EARLIEST_OBSERVATION = new Date(Date.UTC(1610, 0, 1));
/** Clocks drift; allow a little slack before calling an instant "in the future". */
export const FUTURE_TOLERANCE_MS = 5 * 60 * 1000;

export const MAX_GROUPS = 60;
export const MAX_SPOTS = 1500;

/**
 * The one schema for an observation, shared by the form (client side) and
 * the API and server actions. `now` is injectable so tests can pin the clock.
 */
export function makeObservationInputSchema({ now = () => new Date() }: { now?: () => Date } = {}) {
  return z
    .strictObject(
      {
        observedAt: z
          .string({ error: "Enter the date and time of the observation (UT)." })
          .pipe(
            z.iso.datetime({
              offset: true,
              error: "Give the observation time as an ISO 8601 instant, e.g. 2026-03-14T09:30:00Z.",
            }),
          )
          .transform((text) => new Date(text))
          .refine((d) => d.getTime() <= now().getTime() + FUTURE_TOLERANCE_MS, {
            error: "The observation time is in the future. Times are in Universal Time (UT).",
          })
          .refine((d) => d.getTime() >= EARLIEST_OBSERVATION.getTime(), {
            error: "The observation time is before 1610, when telescopic sunspot records begin.",
          }),
        seeing: wholeNumber({ label: "seeing", min: 1, max: 5 }),
        instrumentId: z
          .string({ error: "Choose the instrument you used." })
          .trim()
          .min(1, { error: "Choose the instrument you used." })
          .max(64, { error: "That instrument is not one of yours." }),
        groups: wholeNumber({ label: "the number of groups", min: 0, max: MAX_GROUPS }),
        spots: wholeNumber({ label: "the number of spots", min: 0, max: MAX_SPOTS }),
        northGroups: optionalWholeNumber({ label: "northern groups", min: 0, max: MAX_GROUPS }),
        northSpots: optionalWholeNumber({ label: "northern spots", min: 0, max: MAX_SPOTS }),
        southGroups: optionalWholeNumber({ label: "southern groups", min: 0, max: MAX_GROUPS }),
        southSpots: optionalWholeNumber({ label: "southern spots", min: 0, max: MAX_SPOTS }),
        notes: optionalText({ label: "notes", max: 2000 }),
      },
      {
        error: (issue) =>
          issue.code === "unrecognized_keys" ? `Unknown field: ${issue.keys.join(", ")}.` : undefined,
      },
    )
    .superRefine((value, ctx) => {
      checkCountPair({ groups: value.groups, spots: value.spots, prefix: "", ctx });

      const split = [value.northGroups, value.northSpots, value.southGroups, value.southSpots];
      const given = split.filter((v) => v !== undefined).length;
      if (given === 0) return;
      if (given < 4) {
        for (const key of ["northGroups", "northSpots", "southGroups", "southSpots"] as const) {
          if (value[key] === undefined) {
            ctx.addIssue({
              code: "custom",
              path: [key],
              message: "Give all four hemisphere counts, or none.",
            });
          }
        }
        return;
      }
      const [nG, nS, sG, sS] = split as [number, number, number, number];
      checkCountPair({ groups: nG, spots: nS, prefix: "north", ctx });
      checkCountPair({ groups: sG, spots: sS, prefix: "south", ctx });
      if (nG + sG !== value.groups) {
        ctx.addIssue({
          code: "custom",
          path: ["northGroups"],
          message: `Northern and southern groups (${nG} + ${sG}) must add up to the total of ${value.groups}.`,
        });
      }
      if (nS + sS !== value.spots) {
        ctx.addIssue({
          code: "custom",
          path: ["northSpots"],
          message: `Northern and southern spots (${nS} + ${sS}) must add up to the total of ${value.spots}.`,
        });
      }
    });
}

function checkCountPair({
  groups,
  spots,
  prefix,
  ctx,
}: {
  groups: number;
  spots: number;
  prefix: "" | "north" | "south";
  ctx: z.RefinementCtx;
}) {
  const spotsKey = prefix ? `${prefix}Spots` : "spots";
  const where = prefix ? ` in the ${prefix}ern hemisphere` : "";
  if (groups === 0 && spots > 0) {
    ctx.addIssue({
      code: "custom",
      path: [spotsKey],
      message: `Spots were counted${where} but no groups: every spot belongs to a group.`,
    });
  } else if (spots < groups) {
    ctx.addIssue({
      code: "custom",
      path: [spotsKey],
      message: `Fewer spots than groups${where}: every group has at least one spot.`,
    });
  }
}

export const observationInputSchema = makeObservationInputSchema();
export type ObservationInput = z.output<typeof observationInputSchema>;
/** What a client sends (text or numbers) before validation. */
export type ObservationDraft = z.input<typeof observationInputSchema>;

export const SEEING_LABELS: Record<number, string> = {
  1: "1 — excellent",
  2: "2 — good",
  3: "3 — fair",
  4: "4 — poor",
  5: "5 — very poor",
};
