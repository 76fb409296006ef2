import "server-only";

import { desc, eq } from "drizzle-orm";

import { toDayNumber } from "@/lib/counts/series";
import type { ReferenceImport } from "@/lib/validation/reference-import";

import { getDb } from "../client";
import { referenceSeries, referenceValues, users } from "../schema";

const VALUES_PER_INSERT = 2_000;

export type ReferenceSeriesView = {
  id: string;
  name: string;
  licence: string;
  source: string | null;
  firstDay: string;
  lastDay: string;
  days: number;
  importedAt: string;
  importedBy: string | null;
};

/**
 * Stores a validated reference series and all its daily values in one
 * transaction: a failure part-way leaves nothing behind.
 */
export async function importReferenceSeries({
  input,
  importedByUserId,
}: {
  input: ReferenceImport;
  importedByUserId: string;
}): Promise<ReferenceSeriesView> {
  const db = getDb();
  const id = await db.transaction(async (tx) => {
    const [series] = await tx
      .insert(referenceSeries)
      .values({
        name: input.name,
        licence: input.licence,
        source: input.source,
        importedByUserId,
        firstDay: input.firstDay,
        lastDay: input.lastDay,
        days: input.values.length,
        importedAt: new Date(),
      })
      .returning({ id: referenceSeries.id });
    for (let start = 0; start < input.values.length; start += VALUES_PER_INSERT) {
      await tx
        .insert(referenceValues)
        .values(
          input.values
            .slice(start, start + VALUES_PER_INSERT)
            .map((v) => ({ seriesId: series!.id, day: v.day, value: v.value })),
        );
    }
    return series!.id;
  });
  const view = await getReferenceSeries({ seriesId: id });
  if (!view) throw new Error("The reference series vanished right after it was stored");
  return view;
}

export async function listReferenceSeries(): Promise<ReferenceSeriesView[]> {
  const rows = await getDb()
    .select({
      id: referenceSeries.id,
      name: referenceSeries.name,
      licence: referenceSeries.licence,
      source: referenceSeries.source,
      firstDay: referenceSeries.firstDay,
      lastDay: referenceSeries.lastDay,
      days: referenceSeries.days,
      importedAt: referenceSeries.importedAt,
      importedBy: users.name,
    })
    .from(referenceSeries)
    .leftJoin(users, eq(users.id, referenceSeries.importedByUserId))
    .orderBy(desc(referenceSeries.importedAt));
  return rows.map((r) => ({ ...r, importedAt: r.importedAt.toISOString() }));
}

export async function getReferenceSeries({
  seriesId,
}: {
  seriesId: string;
}): Promise<ReferenceSeriesView | null> {
  const all = await listReferenceSeries();
  return all.find((s) => s.id === seriesId) ?? null;
}

/**
 * A reference series' values by day number. Read as one JSON array: tens of
 * thousands of rows cost far more to hand over one by one.
 */
export async function loadReferenceValues({ seriesId }: { seriesId: string }): Promise<Map<number, number>> {
  const result = await getDb().$client.execute({
    sql: "SELECT json_group_array(json_array(day, value)) AS packed FROM reference_values WHERE series_id = ?",
    args: [seriesId],
  });
  const packed = JSON.parse(String(result.rows[0]?.packed ?? "[]")) as Array<[string, number]>;
  return new Map(packed.map(([day, value]) => [toDayNumber(day), value]));
}
