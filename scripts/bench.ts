/**
 * `npm run bench`: runs every benchmark in tests/bench/ one after another
 * (they measure speed; the test suite never does). Pass names to run only
 * some: `npm run bench -- solar counts`.
 */
import { spawnSync } from "node:child_process";
import { readdirSync } from "node:fs";
import path from "node:path";

const folder = path.join("tests", "bench");
const wanted = process.argv.slice(2);
const files = readdirSync(folder)
  .filter((f) => f.endsWith(".bench.ts"))
  .filter((f) => wanted.length === 0 || wanted.some((w) => f.startsWith(w)))
  .sort();

let failed = 0;
for (const file of files) {
  console.log(`\n=== ${file} ===`);
  const run = spawnSync(
    process.execPath,
    [
      path.join("node_modules", "tsx", "dist", "cli.mjs"),
      "--conditions=react-server",
      path.join(folder, file),
    ],
    {
      stdio: "inherit",
      env: { ...process.env, NODE_ENV: "production", NEXT_TELEMETRY_DISABLED: "1" },
    },
  );
  if (run.status !== 0) failed++;
}
process.exit(failed === 0 ? 0 : 1);
