import { z } from "zod";

import { DEFAULT_MIN_COMMON_DAYS, K_METHODS, type KMethod } from "@/lib/counts/k-coefficient";
import { K_PERIOD_KINDS, type KPeriodKind } from "@/lib/series/periods";

import { capitalise, wholeNumber } from "./fields";

/** Where each setting is kept in the settings table. */
export const K_SETTING_KEYS = {
  periodKind: "k.periodKind",
  method: "k.method",
  minCommonDays: "k.minCommonDays",
  pilotObserverId: "k.pilotObserverId",
  pilotK: "k.pilotK",
  referenceSeriesId: "k.referenceSeriesId",
  driftFraction: "k.driftFraction",
} as const;

/** "network": the network is its own reference, with the pilot held fixed. */
export const NETWORK_REFERENCE = "network";

export type KSettings = {
  periodKind: KPeriodKind;
  method: KMethod;
  minCommonDays: number;
  /** null: the observer with the most accepted counts is the pilot. */
  pilotObserverId: string | null;
  pilotK: number;
  /** A reference_series id, or "network". */
  referenceSeriesId: string;
  driftFraction: number;
};

export const DEFAULT_K_SETTINGS: KSettings = {
  periodKind: "year",
  method: "ratio-of-sums",
  minCommonDays: DEFAULT_MIN_COMMON_DAYS,
  pilotObserverId: null,
  pilotK: 1,
  referenceSeriesId: NETWORK_REFERENCE,
  driftFraction: 0.1,
};

export const K_METHOD_LABELS: Record<KMethod, string> = {
  "ratio-of-sums": "Ratio of sums",
  "mean-of-ratios": "Mean of ratios",
  "median-of-ratios": "Median of ratios",
};

function decimal({ label, min, max }: { label: string; min: number; max: number }) {
  return z.preprocess(
    (v) => (typeof v === "string" ? (v.trim() === "" ? undefined : Number(v.trim().replace(",", "."))) : v),
    z
      .number({
        error: (issue) =>
          issue.input === undefined ? `Enter ${label}.` : `${capitalise(label)} must be a number.`,
      })
      .refine(Number.isFinite, { error: `${capitalise(label)} must be a number.` })
      .min(min, { error: `${capitalise(label)} must be at least ${min}.` })
      .max(max, { error: `${capitalise(label)} can be at most ${max}.` }),
  );
}

/** The coordinator's k settings form and the server action that saves it. */
export const kSettingsSchema = z.strictObject({
  periodKind: z.enum(K_PERIOD_KINDS, { error: "Choose quarter or year." }),
  method: z.enum(K_METHODS as [KMethod, ...KMethod[]], { error: "Choose one of the three methods." }),
  minCommonDays: wholeNumber({ label: "the minimum of common days", min: 2, max: 366 }),
  referenceSeriesId: z
    .string({ error: "Choose a reference." })
    .trim()
    .min(1, { error: "Choose a reference." })
    .max(64, { error: "Choose a reference from the list." }),
  pilotObserverId: z.preprocess(
    (v) => (typeof v === "string" && v.trim() === "" ? null : v),
    z.string().trim().max(64, { error: "Choose a pilot from the list." }).nullable().default(null),
  ),
  pilotK: decimal({ label: "the pilot's k", min: 0.1, max: 10 }),
  driftFraction: decimal({ label: "the drift threshold", min: 0.01, max: 1 }),
});

export type KSettingsInput = z.output<typeof kSettingsSchema>;
