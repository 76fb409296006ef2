import { sql } from "drizzle-orm";
import { index, integer, primaryKey, real, sqliteTable, text, uniqueIndex } from "drizzle-orm/sqlite-core";

import { ROLES, type Role } from "../lib/auth/roles";

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
  ],
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
  (t) => [primaryKey({ columns: [t.classroomId, t.userId] }), uniqueIndex("classroom_members_user_idx").on(t.userId)],
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

export type User = typeof users.$inferSelect;
export type Observer = typeof observers.$inferSelect;
export type Instrument = typeof instruments.$inferSelect;
export type Observation = typeof observations.$inferSelect;
export type NewObservation = typeof observations.$inferInsert;
