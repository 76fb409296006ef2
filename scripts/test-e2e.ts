/**
 * End-to-end tests: checks for Chromium, builds the app when the build is
 * missing or older than the sources, then runs the e2e Vitest project.
 */
import { spawnSync } from "node:child_process";
import { existsSync } from "node:fs";

import { buildIfStale } from "../tests/support/start-app";

const chromium = process.env.CHROMIUM_PATH ?? "/usr/bin/chromium";
if (!existsSync(chromium)) {
  console.error(
    `\nEnd-to-end tests need Debian's Chromium at ${chromium}.\n` +
      "Install it with:  sudo apt-get update && sudo apt-get install -y chromium\n" +
      "(or point CHROMIUM_PATH at another Chromium binary). No browser is ever downloaded.\n",
  );
  process.exit(1);
}

if (!buildIfStale({ why: "for end-to-end tests" })) process.exit(1);

const run = spawnSync("npx", ["vitest", "run", "--project", "e2e", ...process.argv.slice(2)], {
  stdio: "inherit",
});
process.exit(run.status ?? 1);
