import { sql } from "drizzle-orm";
import {
  blob,
  index,
  integer,
  primaryKey,
  real,
  sqliteTable,
  text,
  uniqueIndex,
} from "drizzle-orm/sqlite-core";

import { ROLES, type Role } from "../lib/auth/roles";
import { PACKED_COUNT_SQL } from "../lib/series/packed-count";

const id = () =>
  text("id")
    .primaryKey()
    .$defaultFn(() => crypto.randomUUID());
const createdAt = () =>
  integer("created_at", { mode: "timestamp_ms" })
    .notNull()
    .default(sql`(unixepoch('subsec') * 1000)`);

// ---------------------------------------------------------------------------
// People and sign-in. The first five columns of `users` are the shape the
// next-auth Drizzle adapter expects; the rest are Heliotally's own.
// ---------------------------------------------------------------------------

export const users = sqliteTable("users", {
  id: id(),
  name: text("name"),
  email: text("email").unique(),
  emailVerified: integer("email_verified", { mode: "timestamp_ms" }),
  image: text("image"),
  role: text("role", { enum: ROLES }).$type<Role>().notNull().default("observer"),
  passwordHash: text("password_hash"),
  isDemo: integer("is_demo", { mode: "boolean" }).notNull().default(false),
  disabledAt: integer("disabled_at", { mode: "timestamp_ms" }),
  createdAt: createdAt(),
});

export const accounts = sqliteTable(
  "accounts",
  {
    userId: text("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    type: text("type").$type<"email" | "oauth" | "oidc" | "webauthn">().notNull(),
    provider: text("provider").notNull(),
    providerAccountId: text("provider_account_id").notNull(),
    refresh_token: text("refresh_token"),
    access_token: text("access_token"),
    expires_at: integer("expires_at"),
    token_type: text("token_type"),
    scope: text("scope"),
    id_token: text("id_token"),
    session_state: text("session_state"),
  },
  (t) => [primaryKey({ columns: [t.provider, t.providerAccountId] })],
);

export const sessions = sqliteTable("sessions", {
  sessionToken: text("session_token").primaryKey(),
  userId: text("user_id")
    .notNull()
    .references(() => users.id, { onDelete: "cascade" }),
  expires: integer("expires", { mode: "timestamp_ms" }).notNull(),
});

export const verificationTokens = sqliteTable(
  "verification_tokens",
  {
    identifier: text("identifier").notNull(),
    token: text("token").notNull(),
    expires: integer("expires", { mode: "timestamp_ms" }).notNull(),
  },
  (t) => [primaryKey({ columns: [t.identifier, t.token] })],
);

export const passwordResetTokens = sqliteTable("password_reset_tokens", {
  tokenHash: text("token_hash").primaryKey(),
  userId: text("user_id")
    .notNull()
    .references(() => users.id, { onDelete: "cascade" }),
  expiresAt: integer("expires_at", { mode: "timestamp_ms" }).notNull(),
  usedAt: integer("used_at", { mode: "timestamp_ms" }),
  createdAt: createdAt(),
});

/** Failed sign-ins counted per key ("account:<email>" or "address:<ip>") in a sliding window. */
export const signInThrottle = sqliteTable("sign_in_throttle", {
  key: text("key").primaryKey(),
  failures: integer("failures").notNull().default(0),
  windowStartedAt: integer("window_started_at", { mode: "timestamp_ms" }).notNull(),
  lockedUntil: integer("locked_until", { mode: "timestamp_ms" }),
});

// ---------------------------------------------------------------------------
// Observers, instruments and observations.
// ---------------------------------------------------------------------------

export const observers = sqliteTable(
  "observers",
  {
    id: id(),
    userId: text("user_id")
      .notNull()
      .unique()
      .references(() => users.id, { onDelete: "cascade" }),
    displayName: text("display_name").notNull(),
    /** Our own observer code, e.g. "HT-7KQ2" (see lib/observers/observer-code.ts). */
    code: text("code").notNull().unique(),
    /** ISO 3166-1 alpha-2; null for students, whose location we never ask for. */
    country: text("country"),
    timeZone: text("time_zone").notNull().default("UTC"),
    unitSystem: text("unit_system", { enum: ["metric", "imperial"] })
      .notNull()
      .default("metric"),
    createdAt: createdAt(),
  },
  (t) => [index("observers_display_name_idx").on(t.displayName)],
);

export const INSTRUMENT_KINDS = [
  "pinhole",
  "mirror",
  "eyepiece-projection",
  "camera",
  "filtered-telescope",
] as const;
export type InstrumentKind = (typeof INSTRUMENT_KINDS)[number];

export const instruments = sqliteTable(
  "instruments",
  {
    id: id(),
    observerId: text("observer_id")
      .notNull()
      .references(() => observers.id, { onDelete: "cascade" }),
    name: text("name").notNull(),
    kind: text("kind", { enum: INSTRUMENT_KINDS }).notNull(),
    /** Kind-specific dimensions in millimetres, validated by lib/validation/instrument.ts. */
    params: text("params", { mode: "json" }).$type<Record<string, unknown>>().notNull().default({}),
    notes: text("notes"),
    archivedAt: integer("archived_at", { mode: "timestamp_ms" }),
    createdAt: createdAt(),
  },
  (t) => [index("instruments_observer_idx").on(t.observerId)],
);

export const OBSERVATION_STATUSES = ["submitted", "accepted", "queried", "rejected"] as const;
export type ObservationStatus = (typeof OBSERVATION_STATUSES)[number];
export const OBSERVATION_SOURCES = ["form", "api", "tracer", "photo", "import", "classroom", "demo"] as const;
export type ObservationSource = (typeof OBSERVATION_SOURCES)[number];

export const observations = sqliteTable(
  "observations",
  {
    id: id(),
    observerId: text("observer_id")
      .notNull()
      .references(() => observers.id, { onDelete: "cascade" }),
    instrumentId: text("instrument_id")
      .notNull()
      .references(() => instruments.id, { onDelete: "restrict" }),
    observedAt: integer("observed_at", { mode: "timestamp_ms" }).notNull(),
    /** The UT calendar day the count belongs to, "YYYY-MM-DD". */
    utDate: text("ut_date").notNull(),
    seeing: integer("seeing").notNull(),
    groups: integer("groups").notNull(),
    spots: integer("spots").notNull(),
    northGroups: integer("north_groups"),
    northSpots: integer("north_spots"),
    southGroups: integer("south_groups"),
    southSpots: integer("south_spots"),
    notes: text("notes"),
    /** Set when the count was logged for a scheduled class session. */
    classSessionId: text("class_session_id"),
    /** Set for imported rows: a stable key per logbook line, so a re-import adds nothing twice. */
    importKey: text("import_key"),
    importBatchId: text("import_batch_id"),
    status: text("status", { enum: OBSERVATION_STATUSES }).notNull().default("submitted"),
    source: text("source", { enum: OBSERVATION_SOURCES }).notNull().default("form"),
    createdAt: createdAt(),
    updatedAt: integer("updated_at", { mode: "timestamp_ms" })
      .notNull()
      .default(sql`(unixepoch('subsec') * 1000)`),
  },
  (t) => [
    index("observations_observer_date_idx").on(t.observerId, t.utDate),
    index("observations_date_idx").on(t.utDate),
    index("observations_status_created_idx").on(t.status, t.createdAt),
    index("observations_created_idx").on(t.createdAt),
    uniqueIndex("observations_class_session_idx").on(t.observerId, t.classSessionId),
    uniqueIndex("observations_import_key_idx").on(t.observerId, t.importKey),
    // Covers everything the network series reads from accepted counts, in day
    // order: a full recompute streams it without touching the table or
    // sorting, and refreshing one day is a single range seek.
    index("observations_accepted_day_idx")
      .on(
        t.utDate,
        t.instrumentId,
        t.groups,
        t.spots,
        t.northGroups,
        t.northSpots,
        t.southGroups,
        t.southSpots,
      )
      .where(sql`status = 'accepted'`),
    // Each accepted count packed into one integer, instrument by instrument:
    // the full recompute reads every instrument's counts as one string of
    // these, straight from this index (lib/series/packed-count.ts).
    index("observations_accepted_packed_idx")
      .on(t.instrumentId, sql.raw(PACKED_COUNT_SQL))
      .where(sql`status = 'accepted'`),
  ],
);

/**
 * Each instrument's accepted counts as one binary value (lib/series/count-packs.ts),
 * written by the full recompute and read by the next one instead of the
 * counts themselves. Derived data: a pack is trusted only while its
 * instrument has no row in count_pack_changes.
 */
export const countPacks = sqliteTable("count_packs", {
  instrumentId: text("instrument_id").primaryKey(),
  format: integer("format").notNull(),
  count: integer("count").notNull(),
  packed: blob("packed", { mode: "buffer" }).notNull(),
  createdAt: createdAt(),
});

/**
 * Instruments whose accepted counts changed since their pack was written,
 * one row each, kept by triggers on `observations` (migration
 * 0005_count-packs.sql), so no way of changing a count can forget it. Every
 * change takes a new, larger `seq` (AUTOINCREMENT never reuses one); the
 * recompute clears the changes up to the largest seq it read, and a change
 * made while it ran stays for the next one.
 */
export const countPackChanges = sqliteTable(
  "count_pack_changes",
  {
    seq: integer("seq").primaryKey({ autoIncrement: true }),
    instrumentId: text("instrument_id").notNull(),
  },
  (t) => [uniqueIndex("count_pack_changes_instrument_idx").on(t.instrumentId)],
);

/** One personal reduction coefficient per observer (and optionally instrument) and period. */
export const kCoefficients = sqliteTable(
  "k_coefficients",
  {
    id: id(),
    observerId: text("observer_id")
      .notNull()
      .references(() => observers.id, { onDelete: "cascade" }),
    instrumentId: text("instrument_id").references(() => instruments.id, { onDelete: "cascade" }),
    periodStart: text("period_start").notNull(),
    periodEnd: text("period_end").notNull(),
    k: real("k").notNull(),
    sigma: real("sigma"),
    commonDays: integer("common_days").notNull(),
    method: text("method").notNull(),
    /** "quarter" or "year": how long a period the coefficient was fitted over. */
    periodKind: text("period_kind").notNull().default("year"),
    reference: text("reference").notNull(),
    computedAt: createdAt(),
  },
  (t) => [index("k_observer_period_idx").on(t.observerId, t.periodEnd)],
);

/** Replays of writes that carried an Idempotency-Key header. */
export const idempotencyKeys = sqliteTable(
  "idempotency_keys",
  {
    userId: text("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    key: text("key").notNull(),
    scope: text("scope").notNull(),
    requestHash: text("request_hash").notNull(),
    responseStatus: integer("response_status").notNull(),
    responseBody: text("response_body").notNull(),
    createdAt: createdAt(),
  },
  (t) => [primaryKey({ columns: [t.userId, t.scope, t.key] })],
);

// ---------------------------------------------------------------------------
// Classrooms (filled in by the classroom feature).
// ---------------------------------------------------------------------------

export const classrooms = sqliteTable("classrooms", {
  id: id(),
  educatorUserId: text("educator_user_id")
    .notNull()
    .references(() => users.id, { onDelete: "cascade" }),
  name: text("name").notNull(),
  school: text("school").notNull(),
  termStart: text("term_start").notNull(),
  termEnd: text("term_end").notNull(),
  /** Short code students type to find the classroom. */
  joinCode: text("join_code").notNull().unique(),
  joinOpen: integer("join_open", { mode: "boolean" }).notNull().default(false),
  capacity: integer("capacity").notNull().default(40),
  compareWithOthers: integer("compare_with_others", { mode: "boolean" }).notNull().default(false),
  archivedAt: integer("archived_at", { mode: "timestamp_ms" }),
  createdAt: createdAt(),
});

export const classroomMembers = sqliteTable(
  "classroom_members",
  {
    classroomId: text("classroom_id")
      .notNull()
      .references(() => classrooms.id, { onDelete: "cascade" }),
    userId: text("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    pinHash: text("pin_hash").notNull(),
    joinedAt: createdAt(),
  },
  (t) => [
    primaryKey({ columns: [t.classroomId, t.userId] }),
    uniqueIndex("classroom_members_user_idx").on(t.userId),
  ],
);

// ---------------------------------------------------------------------------
// Mail captured by the local sink (development and demo mode).
// ---------------------------------------------------------------------------

export const capturedMail = sqliteTable("captured_mail", {
  id: id(),
  fromAddress: text("from_address").notNull(),
  toAddress: text("to_address").notNull(),
  subject: text("subject").notNull(),
  textBody: text("text_body"),
  htmlBody: text("html_body"),
  receivedAt: createdAt(),
});

// ---------------------------------------------------------------------------
// Review desk: decisions (the audit trail), automatic flags, notifications.
// ---------------------------------------------------------------------------

export const REVIEW_ACTIONS = ["accepted", "queried", "rejected", "resubmitted", "reopened"] as const;
export type ReviewAction = (typeof REVIEW_ACTIONS)[number];

/** Every status change of an observation: who, when, what and why. Never updated or deleted. */
export const reviewDecisions = sqliteTable(
  "review_decisions",
  {
    id: id(),
    observationId: text("observation_id")
      .notNull()
      .references(() => observations.id, { onDelete: "cascade" }),
    actorUserId: text("actor_user_id")
      .notNull()
      .references(() => users.id),
    action: text("action", { enum: REVIEW_ACTIONS }).notNull(),
    fromStatus: text("from_status", { enum: OBSERVATION_STATUSES }).notNull(),
    toStatus: text("to_status", { enum: OBSERVATION_STATUSES }).notNull(),
    note: text("note"),
    createdAt: createdAt(),
  },
  (t) => [
    index("review_decisions_observation_idx").on(t.observationId, t.createdAt),
    // The Decision log reads the newest decisions first, across all observations,
    // and counts them by kind without reading the table.
    index("review_decisions_created_idx").on(t.createdAt),
    index("review_decisions_action_created_idx").on(t.action, t.createdAt),
  ],
);

export const FLAG_REASONS = [
  "far-from-network",
  "hemispheres-inconsistent",
  "unusual-spots-per-group",
  "second-of-the-day",
] as const;
export type FlagReason = (typeof FLAG_REASONS)[number];

export const observationFlags = sqliteTable(
  "observation_flags",
  {
    id: id(),
    observationId: text("observation_id")
      .notNull()
      .references(() => observations.id, { onDelete: "cascade" }),
    reason: text("reason", { enum: FLAG_REASONS }).notNull(),
    detail: text("detail").notNull(),
    createdAt: createdAt(),
  },
  (t) => [
    index("observation_flags_observation_idx").on(t.observationId),
    index("observation_flags_reason_idx").on(t.reason),
  ],
);

/** Messages shown in a user's Logbook (and also e-mailed). */
export const notifications = sqliteTable(
  "notifications",
  {
    id: id(),
    userId: text("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    kind: text("kind").notNull(),
    message: text("message").notNull(),
    link: text("link"),
    readAt: integer("read_at", { mode: "timestamp_ms" }),
    createdAt: createdAt(),
  },
  (t) => [index("notifications_user_idx").on(t.userId, t.createdAt)],
);

/** Network-wide settings (thresholds, pilot observer, k period...), one JSON value per key. */
export const settings = sqliteTable("settings", {
  key: text("key").primaryKey(),
  value: text("value", { mode: "json" }).notNull(),
  updatedAt: createdAt(),
});

// ---------------------------------------------------------------------------
// Reference series and the network's published series.
// ---------------------------------------------------------------------------

export const referenceSeries = sqliteTable("reference_series", {
  id: id(),
  name: text("name").notNull(),
  licence: text("licence").notNull(),
  source: text("source"),
  importedByUserId: text("imported_by_user_id").references(() => users.id, { onDelete: "set null" }),
  firstDay: text("first_day").notNull(),
  lastDay: text("last_day").notNull(),
  days: integer("days").notNull(),
  importedAt: createdAt(),
});

export const referenceValues = sqliteTable(
  "reference_values",
  {
    seriesId: text("series_id")
      .notNull()
      .references(() => referenceSeries.id, { onDelete: "cascade" }),
    day: text("day").notNull(),
    value: real("value").notNull(),
  },
  (t) => [primaryKey({ columns: [t.seriesId, t.day] })],
);

export const HEMISPHERES = ["all", "N", "S"] as const;
export type Hemisphere = (typeof HEMISPHERES)[number];

/**
 * The daily network index, stored with its running sums so that accepting
 * one observation updates a day in constant time.
 */
export const seriesDaily = sqliteTable(
  "series_daily",
  {
    day: text("day").notNull(),
    hemisphere: text("hemisphere", { enum: HEMISPHERES }).notNull(),
    observers: integer("observers").notNull(),
    sum: real("sum").notNull(),
    sumSquares: real("sum_squares").notNull(),
    mean: real("mean").notNull(),
    sd: real("sd"),
    updatedAt: createdAt(),
  },
  (t) => [primaryKey({ columns: [t.hemisphere, t.day] })],
);

export const seriesMonthly = sqliteTable(
  "series_monthly",
  {
    month: text("month").notNull(),
    hemisphere: text("hemisphere", { enum: HEMISPHERES }).notNull(),
    days: integer("days").notNull(),
    sumOfDailyMeans: real("sum_of_daily_means").notNull(),
    mean: real("mean").notNull(),
    smoothed: real("smoothed"),
    updatedAt: createdAt(),
  },
  (t) => [primaryKey({ columns: [t.hemisphere, t.month] })],
);

export const seriesYearly = sqliteTable(
  "series_yearly",
  {
    year: integer("year").notNull(),
    hemisphere: text("hemisphere", { enum: HEMISPHERES }).notNull(),
    days: integer("days").notNull(),
    mean: real("mean").notNull(),
    updatedAt: createdAt(),
  },
  (t) => [primaryKey({ columns: [t.hemisphere, t.year] })],
);

export const JOB_STATUSES = ["queued", "running", "done", "failed"] as const;

/** Background work a coordinator can follow (full recomputes, large imports). */
export const jobs = sqliteTable(
  "jobs",
  {
    id: id(),
    kind: text("kind").notNull(),
    status: text("status", { enum: JOB_STATUSES }).notNull().default("queued"),
    progress: real("progress").notNull().default(0),
    message: text("message"),
    params: text("params", { mode: "json" }).$type<Record<string, unknown>>().notNull().default({}),
    requestedByUserId: text("requested_by_user_id").references(() => users.id, { onDelete: "set null" }),
    createdAt: createdAt(),
    startedAt: integer("started_at", { mode: "timestamp_ms" }),
    finishedAt: integer("finished_at", { mode: "timestamp_ms" }),
  },
  (t) => [index("jobs_kind_created_idx").on(t.kind, t.createdAt)],
);

// ---------------------------------------------------------------------------
// Disk tracer: tracings and the groups measured on them.
// ---------------------------------------------------------------------------

export const tracings = sqliteTable("tracings", {
  id: id(),
  observationId: text("observation_id")
    .notNull()
    .unique()
    .references(() => observations.id, { onDelete: "cascade" }),
  observerId: text("observer_id")
    .notNull()
    .references(() => observers.id, { onDelete: "cascade" }),
  /** Version of the vector format (lib/validation/tracing.ts). */
  formatVersion: integer("format_version").notNull(),
  /** Increases by one on every save. */
  revision: integer("revision").notNull().default(1),
  vector: text("vector", { mode: "json" }).$type<Record<string, unknown>>().notNull(),
  png: blob("png", { mode: "buffer" }),
  createdAt: createdAt(),
  updatedAt: integer("updated_at", { mode: "timestamp_ms" })
    .notNull()
    .default(sql`(unixepoch('subsec') * 1000)`),
});

export const observationGroups = sqliteTable(
  "observation_groups",
  {
    id: id(),
    observationId: text("observation_id")
      .notNull()
      .references(() => observations.id, { onDelete: "cascade" }),
    number: integer("number").notNull(),
    spots: integer("spots").notNull(),
    zurichClass: text("zurich_class"),
    mcintoshClass: text("mcintosh_class"),
    latitudeDeg: real("latitude_deg").notNull(),
    /** Central meridian distance, positive west. */
    cmdDeg: real("cmd_deg").notNull(),
    carringtonLonDeg: real("carrington_lon_deg").notNull(),
    hemisphere: text("hemisphere", { enum: ["N", "S"] }).notNull(),
    areaMsh: real("area_msh"),
    createdAt: createdAt(),
  },
  (t) => [index("observation_groups_observation_idx").on(t.observationId)],
);

// ---------------------------------------------------------------------------
// Photos of the projected disk (stored by the upload host).
// ---------------------------------------------------------------------------

export const photos = sqliteTable(
  "photos",
  {
    id: id(),
    fileKey: text("file_key").notNull().unique(),
    observerId: text("observer_id")
      .notNull()
      .references(() => observers.id, { onDelete: "cascade" }),
    observationId: text("observation_id").references(() => observations.id, { onDelete: "set null" }),
    name: text("name").notNull(),
    sizeBytes: integer("size_bytes").notNull(),
    mimeType: text("mime_type").notNull(),
    widthPx: integer("width_px"),
    heightPx: integer("height_px"),
    url: text("url").notNull(),
    thumbnailKey: text("thumbnail_key"),
    exifTakenAt: integer("exif_taken_at", { mode: "timestamp_ms" }),
    createdAt: createdAt(),
  },
  (t) => [index("photos_observer_idx").on(t.observerId), index("photos_observation_idx").on(t.observationId)],
);

// ---------------------------------------------------------------------------
// Classroom sessions.
// ---------------------------------------------------------------------------

export const classroomSessions = sqliteTable(
  "classroom_sessions",
  {
    id: id(),
    classroomId: text("classroom_id")
      .notNull()
      .references(() => classrooms.id, { onDelete: "cascade" }),
    title: text("title").notNull(),
    /** The UT day of the session, "YYYY-MM-DD". */
    day: text("day").notNull(),
    opensAt: integer("opens_at", { mode: "timestamp_ms" }).notNull(),
    closesAt: integer("closes_at", { mode: "timestamp_ms" }).notNull(),
    instrumentName: text("instrument_name").notNull(),
    instrumentKind: text("instrument_kind", { enum: INSTRUMENT_KINDS }).notNull(),
    createdAt: createdAt(),
  },
  (t) => [index("classroom_sessions_classroom_idx").on(t.classroomId, t.day)],
);

// ---------------------------------------------------------------------------
// Public API tokens, rate limits, imports.
// ---------------------------------------------------------------------------

export const API_TOKEN_SCOPES = ["read", "read-submit"] as const;

export const apiTokens = sqliteTable(
  "api_tokens",
  {
    id: id(),
    userId: text("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    name: text("name").notNull(),
    /** SHA-256 of the secret; the secret itself is shown once and never stored. */
    tokenHash: text("token_hash").notNull().unique(),
    /** The first characters of the token, to tell tokens apart in lists. */
    prefix: text("prefix").notNull(),
    scope: text("scope", { enum: API_TOKEN_SCOPES }).notNull(),
    lastUsedAt: integer("last_used_at", { mode: "timestamp_ms" }),
    revokedAt: integer("revoked_at", { mode: "timestamp_ms" }),
    createdAt: createdAt(),
  },
  (t) => [index("api_tokens_user_idx").on(t.userId)],
);

/** Fixed-window request counters (per API token, per classroom code attempt...). */
export const rateLimits = sqliteTable("rate_limits", {
  key: text("key").primaryKey(),
  windowStartedAt: integer("window_started_at", { mode: "timestamp_ms" }).notNull(),
  count: integer("count").notNull(),
});

export const importBatches = sqliteTable("import_batches", {
  id: id(),
  observerId: text("observer_id")
    .notNull()
    .references(() => observers.id, { onDelete: "cascade" }),
  byUserId: text("by_user_id").references(() => users.id, { onDelete: "set null" }),
  fileName: text("file_name").notNull(),
  fileHash: text("file_hash").notNull(),
  rowsImported: integer("rows_imported").notNull(),
  rowsSkipped: integer("rows_skipped").notNull(),
  createdAt: createdAt(),
});

export type User = typeof users.$inferSelect;
export type Observer = typeof observers.$inferSelect;
export type Instrument = typeof instruments.$inferSelect;
export type Observation = typeof observations.$inferSelect;
export type NewObservation = typeof observations.$inferInsert;
