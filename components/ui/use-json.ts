"use client";
// Loading JSON from the app's own API for a screen: the body, or the server's error message in
// plain words. Online-only screens use it (the tablet store has its own hooks in lib/local).
import { useCallback, useEffect, useState } from "react";

/** GET a JSON body, never cached; a failed answer throws with the server's message. */
export async function getJson<T>(url: string): Promise<T> {
  const r = await fetch(url, { cache: "no-store" });
  const body = await r.json().catch(() => ({}));
  if (!r.ok) throw new Error(body?.error?.message ?? `The server answered ${r.status}.`);
  return body as T;
}

/**
 * The body at `url`, loaded on mount and again whenever `url` changes. While a new URL loads, the
 * previous body stays on screen (a table does not blink while a filter changes).
 */
export function useJson<T>(url: string): { data: T | null; error: string | null; reload: () => void } {
  const [data, setData] = useState<T | null>(null);
  const [error, setError] = useState<string | null>(null);
  const reload = useCallback(() => {
    setError(null);
    getJson<T>(url).then(setData, (e: Error) => setError(e.message));
  }, [url]);
  useEffect(reload, [reload]);
  return { data, error, reload };
}
