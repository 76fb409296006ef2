/**
 * Starts the built app the way `npm start` does (prepare and seed the demo
 * database, start the mail sink and local photo store, then `next start`) on
 * free ports with a temporary database, and waits until it answers. Shared by
 * tests/e2e/global-setup.ts and the benchmarks, so all run the app the same
 * way. It does not build: callers make .next first with buildIfStale.
 */
import { spawn, spawnSync } from "node:child_process";
import { existsSync, mkdtempSync, readdirSync, rmSync, statSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";

import { findFreePort } from "../../lib/server/free-port";

export type StartedApp = { baseUrl: string; databaseUrl: string; stop: () => Promise<void> };

const START_TIMEOUT_MS = 120_000;

/** What the production build is made from: a change to any of these makes .next stale. */
const SOURCES = [
  "app",
  "components",
  "db",
  "lib",
  "drizzle",
  "public",
  "types",
  "next.config.mjs",
  "tailwind.config.ts",
  "package-lock.json",
];

function newestMtime(entry: string): number {
  if (!existsSync(entry)) return 0;
  const stat = statSync(entry);
  if (!stat.isDirectory()) return stat.mtimeMs;
  return readdirSync(entry).reduce(
    (max, name) => Math.max(max, newestMtime(path.join(entry, name))),
    stat.mtimeMs,
  );
}

/**
 * Runs `next build` when .next/BUILD_ID is missing or older than any source,
 * saying why first. Returns false when the build fails.
 */
export function buildIfStale({ why }: { why: string }): boolean {
  const buildId = path.join(".next", "BUILD_ID");
  const builtAt = existsSync(buildId) ? statSync(buildId).mtimeMs : 0;
  if (builtAt >= Math.max(...SOURCES.map(newestMtime))) return true;
  console.log(`Building the app ${why}…`);
  const build = spawnSync("npx", ["next", "build"], {
    stdio: "inherit",
    env: { ...process.env, NEXT_TELEMETRY_DISABLED: "1" },
  });
  return build.status === 0;
}

/**
 * `label` names the temporary folder and database file (e.g. "e2e" →
 * heliotally-e2e-…/e2e.db). Pass `databaseUrl` to serve an existing
 * database instead; `demo: false` leaves an empty one unseeded.
 */
export async function startBuiltApp({
  label,
  nextAuthSecret,
  databaseUrl: givenDatabaseUrl,
  demo = true,
  front = true,
}: {
  label: string;
  nextAuthSecret: string;
  databaseUrl?: string;
  demo?: boolean;
  /** false: Next on the public port, without the front server (lib/server/front-server.ts). */
  front?: boolean;
}): Promise<StartedApp> {
  const folder = mkdtempSync(path.join(tmpdir(), `heliotally-${label}-`));
  const [port, smtpPort, uploadsPort] = await Promise.all([findFreePort(), findFreePort(), findFreePort()]);
  const baseUrl = `http://localhost:${port}`;
  const databaseUrl = givenDatabaseUrl ?? `file:${path.join(folder, `${label}.db`)}`;
  const tsx = path.join(process.cwd(), "node_modules", "tsx", "dist", "cli.mjs");
  const child = spawn(process.execPath, [tsx, "--conditions=react-server", "scripts/serve.ts", "start"], {
    env: {
      ...process.env,
      PORT: String(port),
      SMTP_PORT: String(smtpPort),
      // serve.ts starts the local photo store here, with its files in the run's temporary folder.
      UPLOADS_FAKE_PORT: String(uploadsPort),
      UPLOADS_FAKE_DATA_DIR: path.join(folder, "uploads"),
      DATABASE_URL: databaseUrl,
      NEXTAUTH_URL: baseUrl,
      NEXTAUTH_SECRET: nextAuthSecret,
      HELIOTALLY_DEMO: demo ? "true" : "false",
      HELIOTALLY_FRONT: front ? "true" : "false",
    },
    stdio: ["ignore", "pipe", "pipe"],
  });
  let output = "";
  child.stdout?.on("data", (d: Buffer) => (output += d.toString()));
  child.stderr?.on("data", (d: Buffer) => (output += d.toString()));

  const deadline = Date.now() + START_TIMEOUT_MS;
  for (;;) {
    if (child.exitCode !== null) throw new Error(`The app exited during start-up:\n${output}`);
    try {
      if ((await fetch(`${baseUrl}/sign-in`)).ok) break;
    } catch {
      // not listening yet
    }
    if (Date.now() > deadline) {
      throw new Error(`The app did not answer within ${START_TIMEOUT_MS / 1000} s:\n${output}`);
    }
    await new Promise((r) => setTimeout(r, 500));
  }

  return {
    baseUrl,
    databaseUrl,
    stop: async () => {
      if (child.exitCode === null) {
        child.kill("SIGTERM");
        await new Promise((r) => child.once("exit", r));
      }
      // The run's temporary folder (its database, unless one was given, and its photos).
      rmSync(folder, { recursive: true, force: true, maxRetries: 3 });
    },
  };
}
