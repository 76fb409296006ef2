import { z } from "zod";

import { explainMcIntoshClass, ZURICH_CLASSES } from "@/lib/solar/classes";

import { MAX_GROUPS, MAX_SPOTS } from "./observation";

/**
 * The Disk tracer's saved form: versioned vector JSON. One schema, used by
 * the tracer before it sends and by the server before it stores. Positions
 * are in document units (the drawing's own pixels, y down); the solar
 * positions are always recomputed from them, never trusted from the client.
 *
 * Version history:
 * - 1: disk (dragged or fitted to limb points), orientation (north mark or
 *   drift line, mirrored flag), spots with optional penumbra and area
 *   ellipse, groups with Zurich and McIntosh classes and optional area,
 *   background image settings.
 */
export const TRACING_FORMAT = "heliotally-tracing";
export const TRACING_FORMAT_VERSION = 1;
/** The vector JSON may be at most this large (UTF-8 bytes). */
export const MAX_TRACING_BYTES = 2 * 1024 * 1024;
/** The rendered PNG may be at most this large (decoded bytes). */
export const MAX_TRACING_PNG_BYTES = 4 * 1024 * 1024;
/** Whole save request: the vector, the PNG as base64 (4/3 larger) and some slack. */
export const MAX_SAVE_REQUEST_BYTES =
  MAX_TRACING_BYTES + Math.ceil((MAX_TRACING_PNG_BYTES * 4) / 3) + 64 * 1024;

const MAX_COORDINATE = 100_000;

const coordinate = (label: string) =>
  z
    .number({ error: `${label} must be a number.` })
    .refine(Number.isFinite, { error: `${label} must be a finite number.` })
    .refine((v) => Math.abs(v) <= MAX_COORDINATE, { error: `${label} is far outside the drawing.` });

const length = (label: string) =>
  z
    .number({ error: `${label} must be a number.` })
    .refine((v) => Number.isFinite(v) && v > 0, { error: `${label} must be greater than zero.` })
    .refine((v) => v <= MAX_COORDINATE, { error: `${label} is larger than any drawing.` });

const elementId = z
  .string({ error: "Every spot and group needs an id." })
  .regex(/^[A-Za-z0-9_-]{1,40}$/, { error: "Ids are 1–40 letters, digits, '-' or '_'." });

const pointSchema = z.strictObject({ x: coordinate("x"), y: coordinate("y") });

export const ellipseSchema = z.strictObject({
  cx: coordinate("The area's centre x"),
  cy: coordinate("The area's centre y"),
  rx: length("The area's width"),
  ry: length("The area's height"),
  rotationDeg: z.number().min(-360).max(360),
});

export const diskSchema = z.strictObject({
  cx: coordinate("The disk centre x"),
  cy: coordinate("The disk centre y"),
  r: length("The disk radius"),
  method: z.enum(["drag", "limb-points"]),
  /** The clicked limb points when the disk was fitted, kept so a refit can start from them. */
  limbPoints: z.array(pointSchema).max(200, { error: "Keep the limb points to 200 or fewer." }),
});

export const orientationSchema = z.discriminatedUnion(
  "mode",
  [
    z.strictObject({ mode: z.literal("north"), point: pointSchema, mirrored: z.boolean() }),
    z.strictObject({ mode: z.literal("drift"), from: pointSchema, to: pointSchema, mirrored: z.boolean() }),
  ],
  { error: 'The orientation is either a north mark ("north") or a drift line ("drift").' },
);

export const spotSchema = z.strictObject({
  id: elementId,
  x: coordinate("A spot's x"),
  y: coordinate("A spot's y"),
  umbraRadius: length("A spot's umbra size"),
  penumbraRadius: length("A spot's penumbra size").nullable(),
  groupId: elementId.nullable(),
  area: ellipseSchema.nullable(),
});

export const groupSchema = z.strictObject({
  id: elementId,
  number: z
    .number({ error: "A group number must be a number." })
    .int({ error: "A group number must be a whole number." })
    .min(1, { error: "Group numbers start at 1." })
    .max(999, { error: "Group numbers go up to 999." }),
  zurichClass: z
    .enum(ZURICH_CLASSES, { error: `A Zurich class is one of ${ZURICH_CLASSES.join(", ")}.` })
    .nullable(),
  mcintoshClass: z
    .string({ error: "A McIntosh class is three letters, e.g. Dai." })
    .superRefine((value, ctx) => {
      const why = explainMcIntoshClass(value);
      if (why) ctx.addIssue({ code: "custom", message: why });
    })
    .nullable(),
  area: ellipseSchema.nullable(),
});

export const backgroundSchema = z.strictObject({
  /** A photo of the projected disk to trace over (added by the photo feature). */
  imageUrl: z.string().max(2048).nullable(),
  photoId: z.string().max(64).nullable(),
  /** CSS-style brightness multiplier: 1 leaves the photo as it is. */
  brightness: z.number().min(0).max(4),
  /** −100 … 100, 0 leaves the photo as it is (Konva's Contrast filter). */
  contrast: z.number().min(-100).max(100),
});

export const tracingDocumentSchema = z
  .strictObject(
    {
      format: z.literal(TRACING_FORMAT, {
        error: `Not a Heliotally tracing (format must be "${TRACING_FORMAT}").`,
      }),
      version: z.literal(TRACING_FORMAT_VERSION, {
        error: `This server reads tracing format version ${TRACING_FORMAT_VERSION}.`,
      }),
      canvas: z.strictObject({
        width: z.number().int().min(100).max(20_000),
        height: z.number().int().min(100).max(20_000),
      }),
      background: backgroundSchema,
      disk: diskSchema.nullable(),
      orientation: orientationSchema.nullable(),
      spots: z.array(spotSchema).max(MAX_SPOTS, { error: `A tracing holds at most ${MAX_SPOTS} spots.` }),
      groups: z
        .array(groupSchema)
        .max(MAX_GROUPS, { error: `A tracing holds at most ${MAX_GROUPS} groups.` }),
    },
    {
      error: (issue) =>
        issue.code === "unrecognized_keys" ? `Unknown field: ${issue.keys.join(", ")}.` : undefined,
    },
  )
  .superRefine((doc, ctx) => {
    const groupIds = new Set<string>();
    doc.groups.forEach((group, index) => {
      if (groupIds.has(group.id)) {
        ctx.addIssue({
          code: "custom",
          path: ["groups", index, "id"],
          message: `Two groups share the id ${group.id}.`,
        });
      }
      groupIds.add(group.id);
    });
    const spotIds = new Set<string>();
    doc.spots.forEach((spot, index) => {
      if (spotIds.has(spot.id)) {
        ctx.addIssue({
          code: "custom",
          path: ["spots", index, "id"],
          message: `Two spots share the id ${spot.id}.`,
        });
      }
      spotIds.add(spot.id);
      if (spot.groupId !== null && !groupIds.has(spot.groupId)) {
        ctx.addIssue({
          code: "custom",
          path: ["spots", index, "groupId"],
          message: `A spot belongs to group ${spot.groupId}, which is not in the tracing.`,
        });
      }
      if (spot.penumbraRadius !== null && spot.penumbraRadius < spot.umbraRadius) {
        ctx.addIssue({
          code: "custom",
          path: ["spots", index, "penumbraRadius"],
          message: "A spot's penumbra must be at least as large as its umbra.",
        });
      }
    });
  });

export type TracingDocument = z.infer<typeof tracingDocumentSchema>;
export type TracingSpot = TracingDocument["spots"][number];
export type TracingGroup = TracingDocument["groups"][number];
export type TracingDisk = NonNullable<TracingDocument["disk"]>;
export type TracingOrientation = NonNullable<TracingDocument["orientation"]>;
export type TracingEllipse = z.infer<typeof ellipseSchema>;

/** Observation counts the observer may edit before saving (defaults: the tracing's own). */
export const tracingCountsSchema = z.strictObject({
  groups: z.number().int().min(0),
  spots: z.number().int().min(0),
  northGroups: z.number().int().min(0).nullable(),
  northSpots: z.number().int().min(0).nullable(),
  southGroups: z.number().int().min(0).nullable(),
  southSpots: z.number().int().min(0).nullable(),
});
export type TracingCountsInput = z.infer<typeof tracingCountsSchema>;

/**
 * The save request. The document is checked on its own (size first, then
 * shape) so that an oversized or foreign file gets its own clear message.
 */
export const saveTracingRequestSchema = z.strictObject(
  {
    document: z.unknown(),
    /** The rendered drawing, "data:image/png;base64,…". */
    png: z
      .string()
      .regex(/^data:image\/png;base64,[A-Za-z0-9+/]+={0,2}$/, {
        error: "The picture must be a PNG data URL.",
      })
      .nullable()
      .optional(),
    /** The revision the tracer started from (0 for a new tracing); a stale one is refused. */
    baseRevision: z.number({ error: "Say which revision you edited." }).int().min(0),
    /** The observation's counts as the observer left them; omitted: take the tracing's. */
    counts: tracingCountsSchema.optional(),
  },
  {
    error: (issue) =>
      issue.code === "unrecognized_keys" ? `Unknown field: ${issue.keys.join(", ")}.` : undefined,
  },
);

export type TracingCheck =
  | { ok: true; document: TracingDocument }
  | { ok: false; tooLarge: boolean; message: string; issues: Array<{ path: string; message: string }> };

export function measureJsonBytes(value: unknown): number {
  return new TextEncoder().encode(JSON.stringify(value) ?? "").byteLength;
}

/** Size, format and version, then shape: the first failure explains itself. */
export function checkTracingDocument(input: unknown): TracingCheck {
  const bytes = measureJsonBytes(input);
  if (bytes > MAX_TRACING_BYTES) {
    return {
      ok: false,
      tooLarge: true,
      message: `The tracing is ${(bytes / 1024 / 1024).toFixed(1)} MB; a tracing may be at most 2 MB. Remove background data or spots and save again.`,
      issues: [],
    };
  }
  if (typeof input === "object" && input !== null && "format" in input && "version" in input) {
    const { format, version } = input as { format: unknown; version: unknown };
    if (format === TRACING_FORMAT && typeof version === "number" && version > TRACING_FORMAT_VERSION) {
      return {
        ok: false,
        tooLarge: false,
        message: `This tracing uses format version ${version}, newer than this server reads (${TRACING_FORMAT_VERSION}).`,
        issues: [],
      };
    }
  }
  const parsed = tracingDocumentSchema.safeParse(input);
  if (!parsed.success) {
    return {
      ok: false,
      tooLarge: false,
      message: "The tracing does not match the Heliotally tracing format.",
      issues: parsed.error.issues.map((issue) => ({
        path: issue.path.map(String).join("."),
        message: issue.message,
      })),
    };
  }
  return { ok: true, document: parsed.data };
}

/** An empty tracing for a new drawing area. */
export function createEmptyTracing({
  width = 1000,
  height = 1000,
}: { width?: number; height?: number } = {}): TracingDocument {
  return {
    format: TRACING_FORMAT,
    version: TRACING_FORMAT_VERSION,
    canvas: { width, height },
    background: { imageUrl: null, photoId: null, brightness: 1, contrast: 0 },
    disk: null,
    orientation: null,
    spots: [],
    groups: [],
  };
}

/** `?at=` for GET /api/v1/solar-orientation. */
export const solarOrientationQuerySchema = z.object({
  at: z
    .string({ error: "Give the instant as ?at=, an ISO 8601 time such as 2026-03-14T09:30:00Z." })
    .pipe(
      z.iso.datetime({
        offset: true,
        error: "Give the instant as an ISO 8601 time such as 2026-03-14T09:30:00Z.",
      }),
    )
    .transform((text) => new Date(text))
    .refine((d) => d.getUTCFullYear() >= 1600 && d.getUTCFullYear() <= 2200, {
      error: "The instant must fall between the years 1600 and 2200.",
    }),
});
