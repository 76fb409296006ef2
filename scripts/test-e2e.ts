/**
 * End-to-end tests: checks for Chromium, builds the app when the build is
 * missing or older than the sources, then runs the e2e Vitest project.
 */
import { spawnSync } from "node:child_process";
import { existsSync, readdirSync, statSync } from "node:fs";
import path from "node:path";

const chromium = process.env.CHROMIUM_PATH ?? "/usr/bin/chromium";
if (!existsSync(chromium)) {
  console.error(
    `\nEnd-to-end tests need Debian's Chromium at ${chromium}.\n` +
      "Install it with:  sudo apt-get update && sudo apt-get install -y chromium\n" +
      "(or point CHROMIUM_PATH at another Chromium binary). No browser is ever downloaded.\n",
  );
  process.exit(1);
}

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

const buildId = path.join(".next", "BUILD_ID");
const builtAt = existsSync(buildId) ? statSync(buildId).mtimeMs : 0;
if (builtAt < Math.max(...SOURCES.map(newestMtime))) {
  console.log("Building the app for end-to-end tests…");
  const build = spawnSync("npx", ["next", "build"], {
    stdio: "inherit",
    env: { ...process.env, NEXT_TELEMETRY_DISABLED: "1" },
  });
  if (build.status !== 0) process.exit(build.status ?? 1);
}

const run = spawnSync("npx", ["vitest", "run", "--project", "e2e", ...process.argv.slice(2)], {
  stdio: "inherit",
});
process.exit(run.status ?? 1);
