/**
 * The routes behind an observer's own Logbook beyond submitting and listing:
 * deleting a count, instruments, the Disk tracer's tracings, photos and a
 * student's count in a class session. Spread into API_ROUTES (routes.ts).
 */
import { z } from "zod";

import { LOGGING_ROLES, ROLES } from "@/lib/auth/roles";
import { instrumentInputSchema, instrumentListQuerySchema } from "@/lib/validation/instrument";
import { observationInputSchema } from "@/lib/validation/observation";
import { photoImageQuerySchema } from "@/lib/validation/photo";
import { saveTracingRequestSchema, tracingDocumentSchema } from "@/lib/validation/tracing";

import type { ApiRoute } from "./routes";
import {
  errorBodySchema,
  instrumentListSchema,
  instrumentViewSchema,
  observationViewSchema,
  photoViewSchema,
  tracingSavedSchema,
  tracingViewSchema,
} from "./schemas";

const idPath = (description: string) => z.object({ id: z.string().min(1).describe(description) });
const observationPath = idPath("The observation's id.");
const instrumentPath = idPath("The instrument's id.");
const photoPath = idPath("The photo's id.");

/** Who may read instruments: their owner, or coordinators (and admins) reading anyone's. */
const INSTRUMENT_READERS = [...LOGGING_ROLES, "coordinator"] as const;

const exampleInstrument = {
  kind: "mirror",
  name: "Window mirror",
  mirrorSizeMm: 50,
  maskDiameterMm: 12,
  throwDistanceMm: 3000,
  incidenceAngleDeg: 20,
  surface: "first",
};

/** A spotless disk, drawn and oriented: the smallest tracing that can be saved. */
const exampleTracing = {
  format: "heliotally-tracing",
  version: 1,
  canvas: { width: 1000, height: 1000 },
  background: { imageUrl: null, photoId: null, brightness: 1, contrast: 0 },
  disk: { cx: 500, cy: 500, r: 400, method: "drag", limbPoints: [] },
  orientation: { mode: "north", point: { x: 500, y: 60 }, mirrored: false },
  spots: [],
  groups: [],
};

/** What the instrument fields mean; lengths are millimetres whatever unitSystem says (it only sets how forms show them). */
const INSTRUMENT_NOTES: Record<string, string> = {
  kind: "Which shape of profile this is; the other fields follow from it.",
  name: "Your name for it, as lists and imports show it.",
  notes: "Free text, at most 2,000 characters.",
  unitSystem: "How the forms show lengths to you (metric or imperial); values here are always mm.",
  holeDiameterMm: "Diameter of the pinhole, mm.",
  boxLengthMm: "Distance from the pinhole to the screen, mm.",
  mirrorSizeMm: "Size of the mirror, mm.",
  maskDiameterMm: "Opening of the mask over the mirror, mm (not larger than the mirror).",
  throwDistanceMm: "Distance from the mirror to the screen, mm.",
  incidenceAngleDeg: "Angle between the sunlight and the mirror's normal, degrees (0–85).",
  surface: "first (a first-surface mirror) or second (an ordinary mirror, coated at the back).",
  apertureMm: "Aperture of the telescope or lens, mm.",
  focalLengthMm: "Focal length of the telescope or lens, mm.",
  eyepieceFocalLengthMm: "Focal length of the eyepiece, mm.",
  eyepieceToScreenMm: "Distance from the eyepiece to the screen, mm.",
  pixelSizeUm: "Pixel size of the camera sensor, µm.",
  magnification: "Magnification used.",
  filter: "The certified solar filter over the front of the instrument.",
};

const inUse = (what: string) => ({
  description: `${what} (the error says how many observations use it).`,
  schema: errorBodySchema,
});

export const OBSERVATION_DELETE_ROUTE: ApiRoute = {
  operationId: "deleteObservation",
  method: "delete",
  path: "/api/v1/observations/{id}",
  tag: "Observations",
  summary: "Delete one of your observations",
  description:
    "Deletes the count with its tracing and photos. The photo files are deleted first: when the photo store cannot be reached nothing is deleted and the answer is 503. A student's class-session count can be deleted only while the session is open (409 afterwards).",
  roles: LOGGING_ROLES,
  scope: "read-submit",
  pathParams: observationPath,
  idempotent: true,
  responses: {
    204: { description: "Deleted." },
    503: { description: "The photo store is not answering; nothing was deleted.", schema: errorBodySchema },
  },
  example: { pathParams: { id: "<observation id>" } },
};

export const INSTRUMENT_ROUTES: ApiRoute[] = [
  {
    operationId: "listInstruments",
    method: "get",
    path: "/api/v1/instruments",
    tag: "Instruments",
    summary: "List instruments",
    description:
      "Your instruments, those in use first, then archived ones, each with how many observations use it and its newest k. Coordinators read any observer's list with observerId.",
    roles: INSTRUMENT_READERS,
    scope: "read",
    query: instrumentListQuerySchema,
    responses: { 200: { description: "The instruments.", schema: instrumentListSchema } },
    example: {},
  },
  {
    operationId: "addInstrument",
    method: "post",
    path: "/api/v1/instruments",
    tag: "Instruments",
    summary: "Add an instrument",
    description:
      "Adds an instrument profile. The fields depend on kind (pinhole, mirror, eyepiece-projection, camera or filtered-telescope); lengths are millimetres, angles degrees. Cameras and filtered telescopes name the certified solar filter over their front.",
    roles: LOGGING_ROLES,
    scope: "read-submit",
    body: {
      schema: instrumentInputSchema,
      contentType: "application/json",
      description: "The instrument profile, one of five shapes chosen by kind.",
      name: "InstrumentInput",
    },
    notes: INSTRUMENT_NOTES,
    idempotent: true,
    responses: { 201: { description: "Added.", schema: instrumentViewSchema } },
    example: { body: exampleInstrument },
  },
  {
    operationId: "getInstrument",
    method: "get",
    path: "/api/v1/instruments/{id}",
    tag: "Instruments",
    summary: "Fetch one instrument",
    description:
      "Your own instrument, archived or not; coordinators may fetch anyone's. Someone else's answers 404 to everyone else.",
    roles: INSTRUMENT_READERS,
    scope: "read",
    pathParams: instrumentPath,
    responses: { 200: { description: "The instrument.", schema: instrumentViewSchema } },
    example: { pathParams: { id: "<instrument id>" } },
  },
  {
    operationId: "reviseInstrument",
    method: "put",
    path: "/api/v1/instruments/{id}",
    tag: "Instruments",
    summary: "Correct an instrument",
    description:
      "Replaces the whole profile (send every field again). Once observations use an instrument its kind stays as it is: archive it and add a new one instead.",
    roles: LOGGING_ROLES,
    scope: "read-submit",
    pathParams: instrumentPath,
    body: {
      schema: instrumentInputSchema,
      contentType: "application/json",
      description: "The whole instrument profile.",
      name: "InstrumentInput",
    },
    notes: INSTRUMENT_NOTES,
    idempotent: true,
    responses: {
      200: { description: "The corrected instrument.", schema: instrumentViewSchema },
      409: inUse("The kind cannot change while observations use the instrument"),
    },
    example: { pathParams: { id: "<instrument id>" }, body: exampleInstrument },
  },
  {
    operationId: "deleteInstrument",
    method: "delete",
    path: "/api/v1/instruments/{id}",
    tag: "Instruments",
    summary: "Delete an unused instrument",
    description:
      "Only an instrument no observation uses can be deleted; one in use answers 409 and can be archived instead.",
    roles: LOGGING_ROLES,
    scope: "read-submit",
    pathParams: instrumentPath,
    idempotent: true,
    responses: { 204: { description: "Deleted." }, 409: inUse("Observations use this instrument") },
    example: { pathParams: { id: "<instrument id>" } },
  },
  {
    operationId: "archiveInstrument",
    method: "post",
    path: "/api/v1/instruments/{id}/archive",
    tag: "Instruments",
    summary: "Archive an instrument",
    description:
      "The instrument leaves your lists and forms but stays on the observations made with it. Archiving an archived instrument changes nothing.",
    roles: LOGGING_ROLES,
    scope: "read-submit",
    pathParams: instrumentPath,
    idempotent: true,
    responses: { 200: { description: "The archived instrument.", schema: instrumentViewSchema } },
    example: { pathParams: { id: "<instrument id>" } },
  },
  {
    operationId: "restoreInstrument",
    method: "delete",
    path: "/api/v1/instruments/{id}/archive",
    tag: "Instruments",
    summary: "Bring an archived instrument back into use",
    description: "Takes the instrument out of the archive.",
    roles: LOGGING_ROLES,
    scope: "read-submit",
    pathParams: instrumentPath,
    idempotent: true,
    responses: { 200: { description: "The instrument, in use again.", schema: instrumentViewSchema } },
    example: { pathParams: { id: "<instrument id>" } },
  },
];

export const TRACING_AND_PHOTO_ROUTES: ApiRoute[] = [
  {
    operationId: "getTracing",
    method: "get",
    path: "/api/v1/observations/{id}/tracing",
    tag: "Tracings and photos",
    summary: "Fetch an observation's tracing",
    description:
      "The Disk tracer's drawing as saved (vector JSON) with the groups measured from it: heliographic latitude, CMD, Carrington longitude, Zurich and McIntosh classes and area in MSH. The owner, coordinators and the owner's educator may read it; a missing, hidden or not-yet-traced one answers 404.",
    roles: ROLES,
    scope: "read",
    pathParams: observationPath,
    responses: { 200: { description: "The tracing.", schema: tracingViewSchema } },
    example: { pathParams: { id: "<observation id>" } },
  },
  {
    operationId: "saveTracing",
    method: "put",
    path: "/api/v1/observations/{id}/tracing",
    tag: "Tracings and photos",
    summary: "Save the tracing of one of your observations",
    description:
      "Stores the drawing, its groups and the observation's counts together, all or nothing. Positions and counts are measured on the server from the drawing (disk and orientation are required, every spot in a group); send counts only to override them. baseRevision is the revision you edited (0 for a new tracing): a stale one answers 409. A changed count goes back to the Review desk. A student's class-session count can be traced only while the session is open (409 afterwards). At most 2 MB of drawing and a 4 MB PNG.",
    roles: LOGGING_ROLES,
    scope: "read-submit",
    pathParams: observationPath,
    body: {
      // The handler checks the document on its own after the envelope, so
      // the document's own schema describes that field here.
      schema: saveTracingRequestSchema.extend({ document: tracingDocumentSchema }),
      contentType: "application/json",
      description:
        "The drawing (format heliotally-tracing, version 1), optionally its PNG, and the revision.",
      name: "TracingSave",
    },
    idempotent: true,
    notes: {
      document: "The drawing: disk, orientation, spots and groups in the drawing's own pixels (y down).",
      png: "The rendered drawing as a PNG data URL, or null.",
      baseRevision: "The revision you started from; 0 for a new tracing.",
      counts: "The observation's counts if you change them; left out, the tracing's own are stored.",
    },
    responses: {
      200: { description: "Saved; the new revision and what was measured.", schema: tracingSavedSchema },
      409: {
        description: "The tracing was saved elsewhere since baseRevision, or its class session has closed.",
        schema: errorBodySchema,
      },
    },
    example: { pathParams: { id: "<observation id>" }, body: { document: exampleTracing, baseRevision: 0 } },
  },
  {
    operationId: "getTracingPicture",
    method: "get",
    path: "/api/v1/observations/{id}/tracing/png",
    tag: "Tracings and photos",
    summary: "Download a tracing's picture",
    description:
      "The PNG saved with the tracing, for the same readers as the tracing. The tracing's pngUrl adds ?revision= so a new save gets a new address.",
    roles: ROLES,
    scope: "read",
    pathParams: observationPath,
    responses: {
      200: {
        description: "The picture.",
        otherTypes: [{ contentType: "image/png", description: "The rendered drawing." }],
      },
    },
    curlSave: "-o tracing.png",
    example: { pathParams: { id: "<observation id>" } },
  },
  {
    operationId: "getPhoto",
    method: "get",
    path: "/api/v1/photos/{id}",
    tag: "Tracings and photos",
    summary: "A photo's facts",
    description:
      "Size, type, pixel dimensions and the time the camera recorded, with the links to its pixels (never its storage address). The owner, coordinators and the owner's educator may read it.",
    roles: ROLES,
    scope: "read",
    pathParams: photoPath,
    responses: { 200: { description: "The photo.", schema: photoViewSchema } },
    example: { pathParams: { id: "<photo id>" } },
  },
  {
    operationId: "getPhotoImage",
    method: "get",
    path: "/api/v1/photos/{id}/image",
    tag: "Tracings and photos",
    summary: "A photo's pixels",
    description:
      "Redirects to a signed link that expires in minutes. The view variant of a TIFF is answered directly as an upright JPEG, since browsers cannot draw TIFF. Photos are added from the Logbook in the browser.",
    roles: ROLES,
    scope: "read",
    pathParams: photoPath,
    query: photoImageQuerySchema,
    notes: {
      variant: "original (as uploaded), view (something a browser can draw) or thumbnail.",
    },
    responses: {
      200: {
        description: "A JPEG copy (view of a TIFF only).",
        otherTypes: [{ contentType: "image/jpeg", description: "An upright JPEG copy." }],
      },
      307: {
        description: "Follow Location to the file.",
        headers: { Location: "A signed link to the file, valid for a few minutes." },
      },
    },
    curlSave: "-L -o photo",
    example: { pathParams: { id: "<photo id>" }, query: { variant: "thumbnail" } },
  },
  {
    operationId: "deletePhoto",
    method: "delete",
    path: "/api/v1/photos/{id}",
    tag: "Tracings and photos",
    summary: "Delete one of your photos",
    description:
      "Deletes the stored files first, then the photo: when the photo store cannot be reached nothing is deleted and the answer is 503.",
    roles: LOGGING_ROLES,
    scope: "read-submit",
    pathParams: photoPath,
    idempotent: true,
    responses: {
      204: { description: "Deleted." },
      503: { description: "The photo store is not answering; nothing was deleted.", schema: errorBodySchema },
    },
    example: { pathParams: { id: "<photo id>" } },
  },
];

export const CLASS_SESSION_COUNT_ROUTE: ApiRoute = {
  operationId: "submitClassSessionCount",
  method: "post",
  path: "/api/v1/classroom-sessions/{id}/observations",
  tag: "Classrooms",
  summary: "Log a student's count for a class session",
  description:
    "The Logbook form's body, sent while the session is open and timed inside its window; one count per student per session, filed under the session's instrument whatever instrumentId says. Students sign in with their class code and PIN and cannot hold API tokens, so this route answers browser sessions only.",
  roles: ["student"],
  scope: "session",
  pathParams: idPath("The class session's id."),
  body: {
    schema: observationInputSchema,
    contentType: "application/json",
    description: "The count.",
    name: "ObservationInput",
  },
  idempotent: true,
  responses: {
    201: { description: "Logged; the observation as the Logbook shows it.", schema: observationViewSchema },
    409: {
      description: "The session is not open, the classroom has finished, or the count was logged already.",
      schema: errorBodySchema,
    },
  },
  example: {
    pathParams: { id: "<session id>" },
    body: {
      observedAt: "2026-03-14T09:30:00Z",
      seeing: 3,
      instrumentId: "<instrument id>",
      groups: 2,
      spots: 9,
    },
  },
};
