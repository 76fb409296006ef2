import "server-only";

import path from "node:path";

import { migrate } from "drizzle-orm/libsql/migrator";

import type { Database } from "./client";

const MIGRATIONS_FOLDER = path.join(process.cwd(), "drizzle");

/**
 * Brings a database to the current schema. Safe to call at every start:
 * Drizzle records applied migrations and skips them.
 */
export async function prepareDatabase({ db, url }: { db: Database; url: string }): Promise<void> {
  if (url.startsWith("file:")) {
    // Write-ahead logging lets readers carry on while one writer commits;
    // The bulk writes pair it with NORMAL sync (ownConnection, db/client.ts).
    await db.$client.execute("PRAGMA journal_mode = WAL");
  }
  await migrate(db, { migrationsFolder: MIGRATIONS_FOLDER });
}
