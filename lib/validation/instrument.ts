import { z } from "zod";

import { UNIT_SYSTEMS } from "@/lib/optics/units";

/**
 * The one schema for an instrument profile, shared by the Instruments form
 * and the server. Lengths arrive in millimetres: the form converts imperial
 * entries first (convertFormLengthsToMm in lib/optics/units.ts). Objects
 * strip unknown keys rather than refuse them, because a form that switched
 * kind may still carry the previous kind's fields.
 *
 * Upper limits are there to catch unit slips (inches typed as mm, metres as
 * mm), not to police unusual instruments, so they are generous.
 */

/** Forms send "" for an empty box; treat it as "not given" rather than zero. */
function blankToUndefined(value: unknown): unknown {
  return value === null || (typeof value === "string" && value.trim() === "") ? undefined : value;
}

function positiveNumber({
  label,
  unit,
  max,
  tooLarge,
  notPositive,
}: {
  label: string;
  unit: string;
  max: number;
  tooLarge: string;
  notPositive?: string;
}) {
  return z.preprocess(
    blankToUndefined,
    z
      // Checked before coercion: Number(undefined) is NaN, which would make
      // "missing" and "not a number" indistinguishable.
      .unknown()
      .refine((value): boolean => value !== undefined, { error: `Enter ${label} (${unit}).`, abort: true })
      .pipe(
        z.coerce
          .number({ error: `${capitalise(label)} must be a number.` })
          .positive({ error: notPositive ?? `${capitalise(label)} must be greater than zero.` })
          .max(max, { error: tooLarge }),
      ),
  );
}

function optionalPositiveNumber(options: Parameters<typeof positiveNumber>[0]) {
  return z.preprocess(
    blankToUndefined,
    z.coerce
      .number({ error: `${capitalise(options.label)} must be a number.` })
      .positive({ error: `${capitalise(options.label)} must be greater than zero, or left blank.` })
      .max(options.max, { error: options.tooLarge })
      .optional(),
  );
}

function filterName() {
  return z
    .string({ error: "Name the solar filter." })
    .trim()
    .min(1, {
      error:
        "Name the certified solar filter that covers the front of the instrument; never observe without one.",
    })
    .max(120, { error: "Keep the filter description under 120 characters." });
}

const commonFields = {
  name: z
    .string({ error: "Give the instrument a name." })
    .trim()
    .min(1, { error: "Give the instrument a name." })
    .max(80, { error: "Keep the name to 80 characters or fewer." }),
  notes: z.preprocess(
    blankToUndefined,
    z
      .string({ error: "Notes must be text." })
      .trim()
      .max(2000, { error: "Keep the notes to 2,000 characters or fewer." })
      .optional(),
  ),
  unitSystem: z.preprocess(
    blankToUndefined,
    z.enum(UNIT_SYSTEMS, { error: "Choose metric or imperial units." }).optional(),
  ),
};

export const pinholeInputSchema = z
  .object({
    kind: z.literal("pinhole"),
    ...commonFields,
    holeDiameterMm: positiveNumber({
      label: "the hole diameter",
      unit: "mm",
      max: 50,
      tooLarge: "A hole over 50 mm (2 in) is not a pinhole. Check the units: the diameter is in millimetres.",
    }),
    boxLengthMm: positiveNumber({
      label: "the box length",
      unit: "mm",
      max: 100_000,
      tooLarge: "A box over 100 m long is not a pinhole box. Check the units: the length is in millimetres.",
    }),
  })
  .superRefine((value, ctx) => {
    // A hole a tenth of the box length blurs the disk ten times over: a typo, not an instrument.
    if (
      isPositive(value.holeDiameterMm) &&
      isPositive(value.boxLengthMm) &&
      value.holeDiameterMm * 10 > value.boxLengthMm
    ) {
      ctx.addIssue({
        code: "custom",
        path: ["holeDiameterMm"],
        message:
          "The hole is more than a tenth of the box length, so no image would form. Check both numbers.",
      });
    }
  });

export const mirrorInputSchema = z
  .object({
    kind: z.literal("mirror"),
    ...commonFields,
    mirrorSizeMm: positiveNumber({
      label: "the mirror size",
      unit: "mm",
      max: 1000,
      tooLarge:
        "A mirror over 1 m across is not a projection mirror. Check the units: the size is in millimetres.",
    }),
    maskDiameterMm: optionalPositiveNumber({
      label: "the mask opening",
      unit: "mm",
      max: 1000,
      tooLarge: "A mask opening over 1 m is not a mask. Check the units: the opening is in millimetres.",
    }),
    throwDistanceMm: positiveNumber({
      label: "the throw distance",
      unit: "mm",
      max: 200_000,
      tooLarge:
        "A throw over 200 m is not practical indoors or out. Check the units: the distance is in millimetres.",
    }),
    incidenceAngleDeg: z.preprocess(
      blankToUndefined,
      z
        .unknown()
        .refine((value): boolean => value !== undefined, {
          error: "Enter the angle of incidence (degrees between the sunlight and the mirror's normal).",
          abort: true,
        })
        .pipe(
          z.coerce
            .number({ error: "The angle of incidence must be a number." })
            .min(0, { error: "The angle of incidence cannot be negative." })
            .max(85, {
              error:
                "Above 85° the light only grazes the mirror. Use an angle from 0° (facing the Sun) to 85°.",
            }),
        ),
    ),
    surface: z.enum(["first", "second"], {
      error: "Choose first-surface or ordinary (second-surface) mirror.",
    }),
  })
  .superRefine((value, ctx) => {
    if (
      isPositive(value.maskDiameterMm) &&
      isPositive(value.mirrorSizeMm) &&
      value.maskDiameterMm > value.mirrorSizeMm
    ) {
      ctx.addIssue({
        code: "custom",
        path: ["maskDiameterMm"],
        message: `The mask opening (${value.maskDiameterMm} mm) can't be larger than the mirror (${value.mirrorSizeMm} mm).`,
      });
    }
  });

export const eyepieceProjectionInputSchema = z
  .object({
    kind: z.literal("eyepiece-projection"),
    ...commonFields,
    apertureMm: positiveNumber({
      label: "the aperture",
      unit: "mm",
      max: 1000,
      tooLarge:
        "An aperture over 1 m is not a projection telescope. Check the units: the aperture is in millimetres.",
    }),
    focalLengthMm: positiveNumber({
      label: "the telescope's focal length",
      unit: "mm",
      max: 20_000,
      tooLarge:
        "A focal length over 20 m is not an amateur telescope. Check the units: it is in millimetres.",
    }),
    eyepieceFocalLengthMm: positiveNumber({
      label: "the eyepiece focal length",
      unit: "mm",
      max: 100,
      tooLarge:
        "Eyepieces have focal lengths of a few millimetres up to about 55 mm; over 100 mm is not an eyepiece.",
      notPositive:
        "The eyepiece focal length can't be zero or negative; use the number printed on the eyepiece (e.g. 25 mm).",
    }),
    eyepieceToScreenMm: positiveNumber({
      label: "the eyepiece-to-screen distance",
      unit: "mm",
      max: 3000,
      tooLarge:
        "A screen over 3 m behind the eyepiece is not practical. Check the units: the distance is in millimetres.",
    }),
  })
  .superRefine((value, ctx) => {
    if (
      isPositive(value.eyepieceFocalLengthMm) &&
      isPositive(value.eyepieceToScreenMm) &&
      value.eyepieceToScreenMm <= value.eyepieceFocalLengthMm
    ) {
      ctx.addIssue({
        code: "custom",
        path: ["eyepieceToScreenMm"],
        message: `The screen must be farther from the eyepiece than its focal length (${value.eyepieceFocalLengthMm} mm), or no image forms.`,
      });
    }
  });

export const cameraInputSchema = z.object({
  kind: z.literal("camera"),
  ...commonFields,
  focalLengthMm: positiveNumber({
    label: "the focal length",
    unit: "mm",
    max: 20_000,
    tooLarge:
      "A focal length over 20 m is not a camera lens or amateur telescope. Check the units: it is in millimetres.",
  }),
  pixelSizeUm: positiveNumber({
    label: "the pixel size",
    unit: "µm",
    max: 50,
    tooLarge: "Camera pixels are a few micrometres; over 50 µm is not a pixel size. Check the units.",
  }),
  filter: filterName(),
  apertureMm: optionalPositiveNumber({
    label: "the aperture",
    unit: "mm",
    max: 1000,
    tooLarge:
      "An aperture over 1 m is not a camera lens or amateur telescope. Check the units: it is in millimetres.",
  }),
});

export const filteredTelescopeInputSchema = z.object({
  kind: z.literal("filtered-telescope"),
  ...commonFields,
  apertureMm: positiveNumber({
    label: "the aperture",
    unit: "mm",
    max: 1000,
    tooLarge:
      "An aperture over 1 m is not an amateur telescope. Check the units: the aperture is in millimetres.",
  }),
  magnification: positiveNumber({
    label: "the magnification",
    unit: "×",
    max: 1000,
    tooLarge: "Over 1000× is far beyond what any telescope can use on the Sun.",
  }),
  filter: filterName(),
});

export const instrumentInputSchema = z.discriminatedUnion(
  "kind",
  [
    pinholeInputSchema,
    mirrorInputSchema,
    eyepieceProjectionInputSchema,
    cameraInputSchema,
    filteredTelescopeInputSchema,
  ],
  {
    error:
      "Choose the kind of instrument: pinhole, mirror, eyepiece-projection, camera or filtered-telescope.",
  },
);

export type InstrumentInput = z.infer<typeof instrumentInputSchema>;

/** Query of GET /api/v1/instruments: coordinators name the observer; owners leave it out (it is ignored). */
export const instrumentListQuerySchema = z.object({
  observerId: z
    .string()
    .trim()
    .max(64, { error: "That is not an observer id." })
    .optional()
    .transform((v) => v || undefined),
});

function isPositive(value: number | undefined): value is number {
  return value !== undefined && Number.isFinite(value) && value > 0;
}

function capitalise(text: string): string {
  return text.charAt(0).toUpperCase() + text.slice(1);
}
