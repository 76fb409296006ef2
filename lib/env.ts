import { z } from "zod";

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
