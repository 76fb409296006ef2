import { z } from "zod";

/** Forms send "" for an empty box; treat it as "not given" rather than zero. */
const emptyToUndefined = (value: unknown) =>
  value === "" || value === null || (typeof value === "string" && value.trim() === "") ? undefined : value;

const toNumber = (value: unknown) => {
  const v = emptyToUndefined(value);
  return typeof v === "string" ? Number(v.trim()) : v;
};

/** A whole number within bounds, accepting text from forms. */
export function wholeNumber({ label, min, max }: { label: string; min: number; max: number }) {
  return z.preprocess(
    toNumber,
    z
      .number({
        error: (issue) =>
          issue.input === undefined ? `Enter ${label}.` : `${capitalise(label)} must be a number.`,
      })
      .refine(Number.isFinite, { error: `${capitalise(label)} must be a number.` })
      .int({ error: `${capitalise(label)} must be a whole number.` })
      .min(min, {
        error:
          min === 0
            ? `${capitalise(label)} cannot be negative.`
            : `${capitalise(label)} must be at least ${min}.`,
      })
      .max(max, { error: `${capitalise(label)} cannot be more than ${max}.` }),
  );
}

export function optionalWholeNumber(options: { label: string; min: number; max: number }) {
  return z.preprocess(emptyToUndefined, wholeNumber(options).optional());
}

export function optionalText({ label, max }: { label: string; max: number }) {
  return z.preprocess(
    (v) => (typeof v === "string" && v.trim() === "" ? undefined : typeof v === "string" ? v.trim() : v),
    z
      .string({ error: `${capitalise(label)} must be text.` })
      .max(max, { error: `${capitalise(label)} can be at most ${max} characters.` })
      .optional(),
  );
}

export function capitalise(text: string): string {
  return text.charAt(0).toUpperCase() + text.slice(1);
}
