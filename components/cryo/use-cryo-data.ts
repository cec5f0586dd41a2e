"use client";
// Client data for derived values and charts: a cryostat's series (levels, fields, stage
// temperatures) and its accepted sensor calibrations. Fetched online and remembered in
// localStorage so the reading forms keep their derived values with no network. The last good copy
// is shown at once; a fetch refreshes it when the server answers.
import { useEffect, useState } from "react";
import { useCryostats } from "@/lib/local/hooks";
import type { CalibrationRecord } from "@/lib/schemas/calibration";
import type { CryostatSeries } from "@/lib/series";

export type { CalibrationRecord, CryostatSeries };

function read<T>(key: string): T | undefined {
  try {
    const raw = localStorage.getItem(key);
    return raw ? (JSON.parse(raw) as T) : undefined;
  } catch {
    return undefined;
  }
}

function write(key: string, value: unknown): void {
  try {
    localStorage.setItem(key, JSON.stringify(value));
  } catch {
    /* storage full or private mode: the figures still work while the page is open */
  }
}

// Several derived values on one form share one request per URL (for a few seconds).
const inflight = new Map<string, { at: number; promise: Promise<{ ok: boolean; status: number; body: unknown }> }>();
const SHARE_MS = 10_000;

function fetchShared(url: string): Promise<{ ok: boolean; status: number; body: unknown }> {
  const hit = inflight.get(url);
  if (hit && Date.now() - hit.at < SHARE_MS) return hit.promise;
  const promise = fetch(url, { cache: "no-store" }).then(async (r) => ({
    ok: r.ok,
    status: r.status,
    body: (await r.json().catch(() => null)) as unknown,
  }));
  inflight.set(url, { at: Date.now(), promise });
  promise.catch(() => inflight.delete(url));
  return promise;
}

/** Forget shared responses (after an upload, so the next read sees it). */
export function refreshCryoData(): void {
  inflight.clear();
}

export type Remote<T> = { data: T | undefined; error: string | null; loading: boolean; stale: boolean };

/** Fetch JSON once per key, serving the remembered copy first. */
function useRemembered<T>(key: string | null, url: string | null, pick: (body: unknown) => T): Remote<T> {
  const [state, setState] = useState<Remote<T>>({ data: undefined, error: null, loading: true, stale: false });
  useEffect(() => {
    if (!key || !url) {
      setState({ data: undefined, error: null, loading: false, stale: false });
      return;
    }
    const cached = read<T>(key);
    setState({ data: cached, error: null, loading: true, stale: cached !== undefined });
    let cancelled = false;
    fetchShared(url)
      .then(({ ok, status, body }) => {
        if (!ok) {
          const message =
            (body as { error?: { message?: string } } | null)?.error?.message ?? `The server answered ${status}.`;
          throw new Error(message);
        }
        const data = pick(body);
        write(key, data);
        if (!cancelled) setState({ data, error: null, loading: false, stale: false });
      })
      .catch((e: unknown) => {
        if (cancelled) return;
        const msg =
          e instanceof TypeError ? "No connection to the server." : e instanceof Error ? e.message : String(e);
        setState({ data: cached, error: msg, loading: false, stale: cached !== undefined });
      });
    return () => {
      cancelled = true;
    };
  }, [key, url, pick]);
  return state;
}

const pickSeries = (body: unknown) => body as CryostatSeries;
const pickCalibrations = (body: unknown) => (body as { calibrations: CalibrationRecord[] }).calibrations;

export function useCryostatSeries(cryostatId: string | undefined): Remote<CryostatSeries> {
  return useRemembered(
    cryostatId ? `rimelog-series-${cryostatId}` : null,
    cryostatId ? `/api/cryostats/${encodeURIComponent(cryostatId)}/series` : null,
    pickSeries,
  );
}

/** The accepted calibrations of a cryostat, newest per stage first. */
export function useCalibrations(cryostatId: string | undefined, refresh = 0): Remote<CalibrationRecord[]> {
  return useRemembered(
    cryostatId ? `rimelog-calibrations-${cryostatId}` : null,
    cryostatId
      ? `/api/calibrations?cryostatId=${encodeURIComponent(cryostatId)}${refresh ? `&v=${refresh}` : ""}`
      : null,
    pickCalibrations,
  );
}

/**
 * The cryostats (id, name, config) for presets: the tablet store's copy (pulled by sync, there
 * offline) when it has one, else the room overview fetched and remembered here.
 */
export function useCryostatList(): Remote<
  { id: string; name: string; config: import("@/lib/schemas/cryostat").CryostatConfig }[]
> {
  const local = useCryostats();
  const remote = useRemembered("rimelog-cryostat-list", "/api/cryostats", pickCryostats);
  if (local && local.length > 0) {
    return {
      data: local.map((c) => ({ id: c.id, name: c.name, config: c.config })),
      error: null,
      loading: false,
      stale: false,
    };
  }
  return remote;
}
const pickCryostats = (body: unknown) =>
  (
    (body as { cryostats?: { id: string; name: string; config: import("@/lib/schemas/cryostat").CryostatConfig }[] })
      .cryostats ?? []
  ).map((c) => ({
    id: c.id,
    name: c.name,
    config: c.config,
  }));
