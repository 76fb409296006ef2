"use client";

import { useEffect, useState } from "react";

/** Fetches JSON from our API once per URL; the error message is the API's own when it gives one. */
export function useJson<T>(url: string | null): { data: T | null; error: string | null; loading: boolean } {
  const [state, setState] = useState<{ url: string | null; data: T | null; error: string | null }>({
    url: null,
    data: null,
    error: null,
  });
  useEffect(() => {
    if (!url) return;
    const controller = new AbortController();
    fetch(url, { signal: controller.signal })
      .then(async (res) => {
        const body = await res.json();
        if (!res.ok) throw new Error(body?.error?.message ?? "The data could not be loaded.");
        setState({ url, data: body as T, error: null });
      })
      .catch((error: unknown) => {
        if (!controller.signal.aborted) setState({ url, data: null, error: (error as Error).message });
      });
    return () => controller.abort();
  }, [url]);
  const current = state.url === url;
  return {
    data: current ? state.data : null,
    error: current ? state.error : null,
    loading: Boolean(url) && !current,
  };
}
