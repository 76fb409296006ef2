import { z } from "zod";

import { normaliseDisplayName, normaliseJoinCode, PIN_LENGTH } from "@/lib/classrooms/codes";
import { INSTRUMENT_KINDS } from "@/lib/optics/types";

import { capitalise, wholeNumber } from "./fields";

/**
 * One schema per classroom input, shared by the forms (client side) and the
 * server actions and route handlers. Forms send text, so every field accepts
 * strings.
 */

export const MAX_CLASS_SIZE = 60;
export const MAX_ENROL_AT_ONCE = 40;
/** Longest class observing session: a double lesson with set-up is about three hours. */
export const MAX_SESSION_MINUTES = 6 * 60;
/** Terms are at most a school year long. */
const MAX_TERM_DAYS = 366;

const DAY_MS = 86_400_000;

function text({ label, min, max }: { label: string; min: number; max: number }) {
  return z
    .string({ error: `Enter ${label}.` })
    .trim()
    .min(1, { error: `Enter ${label}.` })
    .min(min, { error: `Enter at least ${min} characters for ${label}.` })
    .max(max, { error: `${capitalise(label)} can be at most ${max} characters.` });
}

const idField = (label: string) =>
  z
    .string({ error: `Choose ${label}.` })
    .trim()
    .min(1, { error: `Choose ${label}.` })
    .max(64, { error: `That is not ${label} of yours.` });

const isoDay = (label: string) =>
  z
    .string({ error: `Enter ${label}.` })
    .trim()
    .min(1, { error: `Enter ${label}.` })
    .regex(/^\d{4}-\d{2}-\d{2}$/, { error: `Give ${label} as a date like 2026-09-07.` })
    .refine(
      (d) =>
        !Number.isNaN(Date.parse(`${d}T00:00:00Z`)) && new Date(`${d}T00:00:00Z`).toISOString().startsWith(d),
      {
        error: `${capitalise(label)} is not a calendar date.`,
      },
    );

const timeOfDay = (label: string) =>
  z
    .string({ error: `Enter ${label}.` })
    .trim()
    .min(1, { error: `Enter ${label}.` })
    .regex(/^([01]\d|2[0-3]):[0-5]\d$/, { error: `Give ${label} as a 24-hour time like 10:30 (UT).` });

/** Checkboxes send "on" when ticked and nothing when not. */
const checkbox = z.preprocess((v) => v === true || v === "on" || v === "true", z.boolean());

/**
 * A student's display name: chosen by the educator (or the student when
 * joining), seen only inside the classroom. A first name and an initial is
 * enough; e-mail addresses and long full names are refused because the
 * students are likely minors.
 */
export const displayNameField = z
  .string({ error: "Enter a display name, e.g. a first name and an initial." })
  .trim()
  .transform((v) => v.replace(/\s+/g, " "))
  .pipe(
    z
      .string()
      .min(2, { error: "A display name needs at least 2 characters, e.g. a first name and an initial." })
      .max(30, {
        error: "A display name can be at most 30 characters: a first name and an initial is enough.",
      })
      .refine((v) => !v.includes("@"), { error: "Use a first name and an initial, not an e-mail address." })
      .regex(/^[\p{L}\p{M}0-9 .'’-]+$/u, {
        error: "Use letters, digits, spaces, full stops, apostrophes or hyphens only.",
      })
      .refine((v) => /\p{L}/u.test(v), { error: "A display name needs at least one letter." }),
  );

export const joinCodeField = z
  .string({ error: "Enter your classroom code." })
  .transform(normaliseJoinCode)
  .pipe(
    z
      .string()
      .min(3, { error: "Enter your classroom code, e.g. SUN-7KQ4." })
      .max(16, { error: "That is longer than a classroom code. Check the code on your card." }),
  );

export const pinField = z
  .string({ error: "Enter your PIN." })
  .trim()
  .min(1, { error: "Enter your PIN." })
  .regex(new RegExp(`^\\d{${PIN_LENGTH}}$`), {
    error: `Your PIN is the ${PIN_LENGTH} digits on your sign-in card.`,
  });

// ---------------------------------------------------------------------------
// Educator: classrooms
// ---------------------------------------------------------------------------

export const classroomInputSchema = z
  .strictObject({
    name: text({ label: "the class name", min: 2, max: 80 }),
    school: text({ label: "the school", min: 2, max: 120 }),
    termStart: isoDay("the first day of term"),
    termEnd: isoDay("the last day of term"),
    capacity: wholeNumber({ label: "the class size limit", min: 1, max: MAX_CLASS_SIZE }),
  })
  .superRefine((v, ctx) => {
    const days = (Date.parse(v.termEnd) - Date.parse(v.termStart)) / DAY_MS;
    if (days < 0)
      ctx.addIssue({ code: "custom", path: ["termEnd"], message: "The term ends before it starts." });
    else if (days > MAX_TERM_DAYS) {
      ctx.addIssue({
        code: "custom",
        path: ["termEnd"],
        message: "A term can be at most a year long. Make a new classroom for next year.",
      });
    }
  });
export type ClassroomInput = z.output<typeof classroomInputSchema>;

export const classroomSettingsSchema = z.strictObject({
  classroomId: idField("a classroom"),
  joinOpen: checkbox,
  compareWithOthers: checkbox,
  capacity: wholeNumber({ label: "the class size limit", min: 1, max: MAX_CLASS_SIZE }),
});
export type ClassroomSettingsInput = z.output<typeof classroomSettingsSchema>;

export const archiveClassroomSchema = z.strictObject({
  classroomId: idField("a classroom"),
  confirm: z.literal("archive", { error: "Type archive to confirm." }),
});

// ---------------------------------------------------------------------------
// Educator: students
// ---------------------------------------------------------------------------

/** Several students at once, one display name per line. */
export const enrolStudentsSchema = z.strictObject({
  classroomId: idField("a classroom"),
  displayNames: z
    .string({ error: "Enter at least one display name." })
    .transform((v) =>
      v
        .split(/\r?\n/)
        .map((line) => line.trim())
        .filter(Boolean),
    )
    .pipe(
      z
        .array(displayNameField)
        .min(1, { error: "Enter at least one display name, one per line." })
        .max(MAX_ENROL_AT_ONCE, { error: `Enrol at most ${MAX_ENROL_AT_ONCE} students at a time.` })
        .superRefine((names, ctx) => {
          const seen = new Set<string>();
          for (const name of names) {
            const key = normaliseDisplayName(name);
            if (seen.has(key)) {
              ctx.addIssue({
                code: "custom",
                message: `"${name}" is listed twice. Add an initial to tell them apart.`,
              });
              return;
            }
            seen.add(key);
          }
        }),
    ),
});
export type EnrolStudentsInput = z.output<typeof enrolStudentsSchema>;

export const studentActionSchema = z.strictObject({
  classroomId: idField("a classroom"),
  studentUserId: idField("a student"),
});

export const removeStudentSchema = studentActionSchema.extend({
  confirm: z.literal("remove", { error: "Type remove to confirm." }),
});

export const moveStudentSchema = studentActionSchema
  .extend({ targetClassroomId: idField("the classroom to move to") })
  .refine((v) => v.targetClassroomId !== v.classroomId, {
    path: ["targetClassroomId"],
    error: "Choose a different classroom to move to.",
  });

// ---------------------------------------------------------------------------
// Educator: sessions
// ---------------------------------------------------------------------------

export const sessionInputSchema = z
  .strictObject({
    classroomId: idField("a classroom"),
    title: text({ label: "a title", min: 2, max: 80 }),
    day: isoDay("the day (UT)"),
    opensAt: timeOfDay("the opening time"),
    closesAt: timeOfDay("the closing time"),
    instrumentName: text({ label: "the instrument's name", min: 2, max: 80 }),
    instrumentKind: z.enum(INSTRUMENT_KINDS, {
      error: "Choose the kind of instrument set up for the class.",
    }),
  })
  .superRefine((v, ctx) => {
    const minutes = toMinutes(v.closesAt) - toMinutes(v.opensAt);
    if (minutes <= 0) {
      ctx.addIssue({
        code: "custom",
        path: ["closesAt"],
        message: "The session must close after it opens, on the same UT day.",
      });
    } else if (minutes > MAX_SESSION_MINUTES) {
      ctx.addIssue({
        code: "custom",
        path: ["closesAt"],
        message: `A session can be open for at most ${MAX_SESSION_MINUTES / 60} hours.`,
      });
    }
  })
  .transform((v) => ({
    ...v,
    opensAtUt: new Date(`${v.day}T${v.opensAt}:00Z`),
    closesAtUt: new Date(`${v.day}T${v.closesAt}:00Z`),
  }));
export type SessionInput = z.output<typeof sessionInputSchema>;

function toMinutes(hhmm: string): number {
  const [h, m] = hhmm.split(":").map(Number);
  return (h ?? 0) * 60 + (m ?? 0);
}

export const K_METHOD_VALUES = ["ratio-of-sums", "mean-of-ratios", "median-of-ratios"] as const;

/** Query of the term table export. */
export const termExportQuerySchema = z.strictObject({
  method: z
    .enum(K_METHOD_VALUES, { error: "method is ratio-of-sums, mean-of-ratios or median-of-ratios." })
    .default("ratio-of-sums"),
});

// ---------------------------------------------------------------------------
// Students: signing in and joining
// ---------------------------------------------------------------------------

export const classroomSignInSchema = z.object({
  code: joinCodeField,
  displayName: displayNameField,
  pin: pinField,
});
export type ClassroomSignInInput = z.output<typeof classroomSignInSchema>;

export const joinClassroomSchema = z.strictObject({
  code: joinCodeField,
  displayName: displayNameField,
});
export type JoinClassroomInput = z.output<typeof joinClassroomSchema>;
