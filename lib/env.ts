import { z } from "zod";

import { LOCAL_UPLOADTHING_TOKEN } from "../uploads-fake/token";

/**
 * Environment, read once and validated. Every default makes the embedded,
 * single-machine mode work with no environment file at all.
 */
const envSchema = z.object({
  NODE_ENV: z.enum(["development", "production", "test"]).default("development"),
  PORT: z.coerce.number().int().min(1).max(65535).default(3000),
  /** `file:` for the embedded database; `libsql://`, `http(s)://` for a libSQL server. */
  DATABASE_URL: z.string().min(1).default("file:./data/heliotally.db"),
  DATABASE_AUTH_TOKEN: z.string().optional(),
  /** With a `file:` DATABASE_URL: keep an embedded replica synced from this libSQL server. */
  DATABASE_SYNC_URL: z.string().optional(),
  DATABASE_SYNC_INTERVAL_S: z.coerce.number().int().min(1).optional(),
  NEXTAUTH_URL: z.string().url().optional(),
  NEXTAUTH_SECRET: z.string().min(16).optional(),
  SMTP_HOST: z.string().default("127.0.0.1"),
  SMTP_PORT: z.coerce.number().int().min(1).max(65535).default(2525),
  SMTP_USER: z.string().optional(),
  SMTP_PASSWORD: z.string().optional(),
  SMTP_SECURE: z
    .enum(["true", "false"])
    .default("false")
    .transform((v) => v === "true"),
  MAIL_FROM: z.string().default("Heliotally <no-reply@heliotally.example.test>"),
  /** "true" shows demo accounts on the sign-in page and the demo-data labels. */
  HELIOTALLY_DEMO: z
    .enum(["true", "false"])
    .default("true")
    .transform((v) => v === "true"),
  /** Requests each API token may make per minute (fixed window). */
  API_RATE_LIMIT_PER_MINUTE: z.coerce.number().int().min(1).max(100_000).default(300),
  /**
   * Photo storage through the uploadthing SDK (the SDK's own variables). With
   * the local development token (the default) the other variables default to
   * the local storage host, uploads-fake; with a real token they stay unset
   * and the SDK uses the hosted service. See getUploadthingEnv().
   */
  UPLOADTHING_TOKEN: z.string().min(1).default(LOCAL_UPLOADTHING_TOKEN),
  UPLOADTHING_INGEST_URL: z.string().url().optional(),
  UPLOADTHING_API_URL: z.string().url().optional(),
  UPLOADTHING_UFS_HOST: z.string().min(1).optional(),
  UPLOADTHING_UFS_APP_ID_LOCATION: z.enum(["subdomain", "path"]).optional(),
  UPLOADTHING_CALLBACK_URL: z.string().url().optional(),
  /** Port of the local storage host that `npm run dev` / `npm start` start with the local token. */
  UPLOADS_FAKE_PORT: z.coerce.number().int().min(1).max(65535).default(3100),
  /** Where that local storage host keeps its files. */
  UPLOADS_FAKE_DATA_DIR: z.string().min(1).default("data/uploads"),
  /**
   * `npm start` only: "true" puts the front server on PORT (it answers the
   * published-series pages and passes everything else to Next behind it);
   * "false" serves Next on PORT directly.
   */
  HELIOTALLY_FRONT: z
    .enum(["true", "false"])
    .default("true")
    .transform((v) => v === "true"),
  /** "true" starts the local mail sink and lists captured mail on the admin pages. */
  MAIL_SINK: z
    .enum(["true", "false"])
    .default("true")
    .transform((v) => v === "true"),
});

export type Env = z.infer<typeof envSchema>;

let cached: Env | undefined;

export function getEnv(): Env {
  if (cached) return cached;
  const parsed = envSchema.safeParse(process.env);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((i) => `  ${i.path.join(".")}: ${i.message}`).join("\n");
    throw new Error(`Heliotally cannot start: invalid environment\n${lines}`);
  }
  cached = parsed.data;
  return cached;
}

/** For tests that change the environment between cases. */
export function resetEnvCache(): void {
  cached = undefined;
}

export type UploadthingEnv = {
  token: string;
  /** True when the app uses the local storage host (the local development token). */
  local: boolean;
  ingestUrl?: string;
  apiUrl?: string;
  ufsHost?: string;
  ufsAppIdLocation?: "subdomain" | "path";
  callbackUrl: string;
};

/**
 * The SDK's settings with the embedded-mode defaults filled in: with the local
 * token every host is the local storage host on UPLOADS_FAKE_PORT; with a
 * real token only what is set is passed, so the SDK's hosted defaults apply.
 */
export function getUploadthingEnv(env: Env = getEnv()): UploadthingEnv {
  const local = env.UPLOADTHING_TOKEN === LOCAL_UPLOADTHING_TOKEN;
  const fake = `http://localhost:${env.UPLOADS_FAKE_PORT}`;
  const appUrl = env.NEXTAUTH_URL ?? `http://localhost:${env.PORT}`;
  const pick = <T>(value: T | undefined, localDefault: T): T | undefined =>
    value ?? (local ? localDefault : undefined);
  const ingestUrl = pick(env.UPLOADTHING_INGEST_URL, fake);
  const apiUrl = pick(env.UPLOADTHING_API_URL, fake);
  const ufsHost = pick(env.UPLOADTHING_UFS_HOST, `localhost:${env.UPLOADS_FAKE_PORT}`);
  const ufsAppIdLocation = pick(env.UPLOADTHING_UFS_APP_ID_LOCATION, "path" as const);
  return {
    token: env.UPLOADTHING_TOKEN,
    local,
    ...(ingestUrl ? { ingestUrl } : {}),
    ...(apiUrl ? { apiUrl } : {}),
    ...(ufsHost ? { ufsHost } : {}),
    ...(ufsAppIdLocation ? { ufsAppIdLocation } : {}),
    callbackUrl: env.UPLOADTHING_CALLBACK_URL ?? `${appUrl.replace(/\/$/, "")}/api/uploadthing`,
  };
}
