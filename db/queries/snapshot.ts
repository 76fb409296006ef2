import "server-only";

import { getDb } from "../client";

/**
 * Writes a consistent copy of the whole database to `path` (SQLite's
 * VACUUM INTO runs as one read transaction, so writers carry on and the copy
 * is a single point in time, compacted and without the WAL).
 */
export async function vacuumInto({ path }: { path: string }): Promise<void> {
  await getDb().$client.execute({ sql: "VACUUM INTO ?", args: [path] });
}
