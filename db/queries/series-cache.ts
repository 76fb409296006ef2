import "server-only";

import type { SeriesKind, SeriesQuery } from "@/lib/validation/series-query";

import { listSeriesPage, type SeriesRowOf } from "./series-read";
import { getSeriesRevision } from "./series";

type Page = { rows: unknown[]; total: number };
type Cache = { revision: number; pages: Map<string, Page> };

/** Enough for every page a few dozen readers look at between two review decisions. */
const MAX_PAGES = 500;
const store = globalThis as unknown as { __heliotallySeriesPages?: Cache };

/**
 * Series pages change only when the series is written (a review decision, a
 * recompute), and every write raises the series revision. So a page is
 * served from memory until the revision moves; checking the revision is one
 * primary-key read, cheaper than sorting a range of the series again.
 */
export async function listSeriesPageCached<K extends SeriesKind>({
  kind,
  query,
}: {
  kind: K;
  query: SeriesQuery<K>;
}): Promise<{ rows: Array<SeriesRowOf<K>>; total: number }> {
  const revision = await getSeriesRevision();
  let cache = store.__heliotallySeriesPages;
  if (!cache || cache.revision !== revision) {
    cache = { revision, pages: new Map() };
    store.__heliotallySeriesPages = cache;
  }
  const key = JSON.stringify([
    kind,
    query.hemisphere,
    query.from,
    query.to,
    query.page,
    query.pageSize,
    query.sort.column,
    query.sort.direction,
  ]);
  const hit = cache.pages.get(key);
  if (hit) {
    // Map keeps insertion order: re-inserting marks the page as recently used.
    cache.pages.delete(key);
    cache.pages.set(key, hit);
    return hit as { rows: Array<SeriesRowOf<K>>; total: number };
  }
  const page = await listSeriesPage({ kind, query });
  if (store.__heliotallySeriesPages === cache) {
    cache.pages.set(key, page);
    if (cache.pages.size > MAX_PAGES) cache.pages.delete(cache.pages.keys().next().value!);
  }
  return page;
}
