/**
 * `npm test`: lint, formatting, typecheck, unit, integration and end-to-end tests, in
 * that order, stopping at the first failure. Ends with one summary line
 * ("tests: N passed, N failed") counted from Vitest's JSON reports.
 */
import { spawnSync } from "node:child_process";
import { existsSync, mkdirSync, readFileSync, rmSync } from "node:fs";
import path from "node:path";

const reports = path.join("test-results", "reports");
rmSync(reports, { recursive: true, force: true });
mkdirSync(reports, { recursive: true });
const json = (name: string) => [
  "--reporter=default",
  "--reporter=json",
  `--outputFile.json=${path.join(reports, `${name}.json`)}`,
];

const steps: Array<[string, string[]]> = [
  ["lint", ["npm", "run", "lint"]],
  ["format", ["npm", "run", "format:check"]],
  ["typecheck", ["npm", "run", "typecheck"]],
  [
    "unit and integration tests",
    ["npx", "vitest", "run", "--project", "unit", "--project", "integration", ...json("unit-integration")],
  ],
  ["end-to-end tests", ["npx", "tsx", "scripts/test-e2e.ts", ...json("e2e")]],
];

function tally(): { passed: number; failed: number } {
  let passed = 0;
  let failed = 0;
  for (const name of ["unit-integration", "e2e"]) {
    const file = path.join(reports, `${name}.json`);
    if (!existsSync(file)) continue;
    const report = JSON.parse(readFileSync(file, "utf8")) as {
      numPassedTests: number;
      numFailedTests: number;
    };
    passed += report.numPassedTests;
    failed += report.numFailedTests;
  }
  return { passed, failed };
}

const started = Date.now();
for (const [name, [cmd, ...args]] of steps) {
  const t = Date.now();
  console.log(`\n=== ${name} ===`);
  const result = spawnSync(cmd!, args, {
    stdio: "inherit",
    env: { ...process.env, NEXT_TELEMETRY_DISABLED: "1" },
  });
  if (result.status !== 0) {
    const { passed, failed } = tally();
    console.error(`\n✗ ${name} failed (exit ${result.status}).`);
    console.log(`tests: ${passed} passed, ${Math.max(failed, 1)} failed`);
    process.exit(result.status ?? 1);
  }
  console.log(`✓ ${name} passed in ${((Date.now() - t) / 1000).toFixed(1)} s`);
}
const { passed, failed } = tally();
console.log(`\nAll checks passed in ${((Date.now() - started) / 1000).toFixed(1)} s.`);
console.log(`tests: ${passed} passed, ${failed} failed`);
