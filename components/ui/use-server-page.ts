"use client";

import { useEffect, useState } from "react";

/**
 * The page of a server-paged table: fetches `url` whenever it (or `refresh`)
 * changes, drops the answer to a request the reader has already moved on
 * from, and says whether the page shown is the one asked for. `url: null`
 * fetches nothing (the caller has a filter to explain first). `shownUrl` is
 * the URL the page shown came from.
 */
export function useServerPage<Page>({
  url,
  initial,
  failure,
  refresh = 0,
}: {
  url: string | null;
  initial: Page;
  /** The message when the server answers with an error but no message of its own. */
  failure: string;
  /** Bump to fetch the same URL again (after a change the page must show). */
  refresh?: number;
}): { page: Page; shownUrl: string | null; loading: boolean; error: string | null } {
  const [shown, setShown] = useState<{ page: Page; url: string | null }>({ page: initial, url: null });
  const [answered, setAnswered] = useState<{ key: string; error: string | null } | null>(null);
  const key = url === null ? null : `${url}#${refresh}`;

  useEffect(() => {
    if (url === null || key === null) return;
    const controller = new AbortController();
    fetch(url, { signal: controller.signal })
      .then(async (res) => {
        const body = await res.json();
        if (!res.ok) throw new Error(body?.error?.message ?? failure);
        setShown({ page: body as Page, url });
        setAnswered({ key, error: null });
      })
      .catch((e: unknown) => {
        if (!controller.signal.aborted) setAnswered({ key, error: (e as Error).message });
      });
    return () => controller.abort();
  }, [url, key, failure]);

  return {
    page: shown.page,
    shownUrl: shown.url,
    loading: key !== null && answered?.key !== key,
    error: key !== null && answered?.key === key ? answered.error : null,
  };
}
