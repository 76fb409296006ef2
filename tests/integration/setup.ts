/**
 * Every integration test file gets its own temporary SQLite database,
 * migrated from drizzle/, and a fixed auth secret.
 */
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";

import { afterAll, beforeAll } from "vitest";

const folder = mkdtempSync(path.join(tmpdir(), "heliotally-it-"));
process.env.DATABASE_URL = `file:${path.join(folder, "test.db")}`;
process.env.NEXTAUTH_SECRET = "integration-test-secret-integration-test-secret";
process.env.NEXTAUTH_URL = "http://localhost:3999";
process.env.HELIOTALLY_DEMO = "false";

beforeAll(async () => {
  const { getDb } = await import("@/db/client");
  const { prepareDatabase } = await import("@/db/prepare");
  await prepareDatabase({ db: getDb(), url: process.env.DATABASE_URL! });
});

afterAll(async () => {
  const { getDb } = await import("@/db/client");
  getDb().$client.close();
  rmSync(folder, { recursive: true, force: true });
});
