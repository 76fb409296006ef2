import "server-only";

import { mkdirSync } from "node:fs";
import path from "node:path";

import { createClient, type Client } from "@libsql/client";
import { drizzle, type LibSQLDatabase } from "drizzle-orm/libsql";

import { getEnv } from "@/lib/env";

import * as schema from "./schema";

export type Database = LibSQLDatabase<typeof schema> & { $client: Client };

type Cache = { db?: Database; url?: string };
// Next's dev server reloads modules on every change; keeping the client on
// globalThis stops each reload from opening another pool of connections.
const cache = globalThis as unknown as { __heliotallyDb?: Cache };

/** Opens (or reuses) the database named by DATABASE_URL. */
export function getDb(): Database {
  const { DATABASE_URL } = getEnv();
  const slot = (cache.__heliotallyDb ??= {});
  if (slot.db && slot.url === DATABASE_URL) return slot.db;
  slot.db?.$client.close();
  slot.db = openDatabase({ url: DATABASE_URL });
  slot.url = DATABASE_URL;
  return slot.db;
}

export function openDatabase({ url }: { url: string }): Database {
  const env = getEnv();
  const isFile = url.startsWith("file:");
  if (isFile) ensureParentFolder(url);
  const client = createClient({
    url,
    authToken: env.DATABASE_AUTH_TOKEN,
    // An embedded replica: reads from the local file, writes go to the server.
    syncUrl: isFile ? env.DATABASE_SYNC_URL : undefined,
    syncInterval: isFile ? env.DATABASE_SYNC_INTERVAL_S : undefined,
    // Wait for a writer in another process (the mail sink, a seed) instead of
    // failing at once with SQLITE_BUSY.
    timeout: 5_000,
  });
  return drizzle(client, { schema });
}

function ensureParentFolder(url: string): void {
  const file = url.replace(/^file:(\/\/)?/, "").split("?")[0] ?? "";
  if (!file || file === ":memory:") return;
  mkdirSync(path.dirname(path.resolve(/*turbopackIgnore: true*/ file)), { recursive: true });
}
