import "server-only";

import type { Transaction } from "@libsql/client";

import { COUNT_PACK_FORMAT, readCountPack, type CountPack } from "@/lib/series/count-packs";

import type { WriteStep } from "../bulk-write";

/**
 * The stored count packs (lib/series/count-packs.ts) a full recompute can
 * trust, read inside its read transaction so they and the changes agree:
 * - `packs`: instrument id → pack, for every instrument with a readable pack
 *   of the current format and no change since it was written; every other
 *   instrument must be read from the observations (an instrument without
 *   accepted counts has an empty pack, once read);
 * - `changesUpTo`: the largest change seq read (null: none), which the
 *   recompute clears once it has stored fresh packs.
 */
export async function readTrustedPacks(reader: Transaction): Promise<{
  packs: Map<string, CountPack>;
  /** Every instrument with a stored pack, trusted or not. */
  storedFor: string[];
  changesUpTo: number | null;
}> {
  const changes = await reader.execute("SELECT instrument_id AS instrumentId, seq FROM count_pack_changes");
  const stale = new Set<string>();
  let changesUpTo: number | null = null;
  for (const row of changes.rows) {
    stale.add(String(row.instrumentId));
    changesUpTo = Math.max(changesUpTo ?? 0, Number(row.seq));
  }
  const stored = await reader.execute(
    "SELECT instrument_id AS instrumentId, format, count, packed FROM count_packs",
  );
  const packs = new Map<string, CountPack>();
  const storedFor: string[] = [];
  for (const row of stored.rows) {
    const instrumentId = String(row.instrumentId);
    storedFor.push(instrumentId);
    if (stale.has(instrumentId)) continue;
    const pack =
      Number(row.format) === COUNT_PACK_FORMAT && row.packed instanceof ArrayBuffer
        ? readCountPack(row.packed, Number(row.count))
        : null;
    if (pack) packs.set(instrumentId, pack);
  }
  return { packs, storedFor, changesUpTo };
}

/**
 * The writes that store freshly built packs (empty ones too: an instrument
 * read and found without accepted counts is then not read again), remove
 * the packs of instruments since deleted, and clear the changes read; part
 * of the recompute's one write transaction. A change made after the read
 * has a larger seq and stays, so the next recompute reads that instrument
 * again.
 */
export function countPackWrites({
  rebuilt,
  dropped,
  changesUpTo,
}: {
  rebuilt: ReadonlyArray<{ instrumentId: string; count: number; bytes: Uint8Array }>;
  dropped: readonly string[];
  changesUpTo: number | null;
}): WriteStep[] {
  if (rebuilt.length === 0 && dropped.length === 0 && changesUpTo === null) return [];
  return [
    {
      sql: "DELETE FROM count_packs WHERE instrument_id IN (SELECT value FROM json_each(?))",
      args: [JSON.stringify([...rebuilt.map((r) => r.instrumentId), ...dropped])],
    },
    {
      table: "count_packs",
      columns: ["instrument_id", "format", "count", "packed"],
      rows: rebuilt.map((r) => [
        r.instrumentId,
        COUNT_PACK_FORMAT,
        r.count,
        Buffer.from(r.bytes.buffer, r.bytes.byteOffset, r.bytes.byteLength),
      ]),
    },
    ...(changesUpTo === null
      ? []
      : [{ sql: "DELETE FROM count_pack_changes WHERE seq <= ?", args: [changesUpTo] }]),
  ];
}
