"use client";
// Live queries on the tablet store for React screens: they re-render when the store changes
// (a local write, a sync). `undefined` means "still loading"; the UI never waits for the network.
import { useLiveQuery } from "dexie-react-hooks";
import { useEffect, useMemo, useState } from "react";
import { type LocalCryostat, type LocalTemplate, type LocalUser, localDb, type StoredLocalEntry } from "./db";
import { type EntryFilter, queryEntries, queryEntry, type SyncSummary, syncSummary } from "./queries";

export type { LocalCryostat, LocalTemplate, LocalUser } from "./db";

/** Pulled + local entries (each with `sync`: pending / synced / rejected), newest first. */
export function useEntries(filter: EntryFilter = {}): StoredLocalEntry[] | undefined {
  const key = JSON.stringify(filter);
  return useLiveQuery(() => queryEntries(localDb(), filter), [key]);
}

export function useEntry(id: string | undefined): StoredLocalEntry | null | undefined {
  return useLiveQuery(async () => (id ? queryEntry(localDb(), id) : null), [id]);
}

export function useCryostats(): LocalCryostat[] | undefined {
  return useLiveQuery(
    async () => (await localDb().cryostats.toArray()).sort((a, b) => a.name.localeCompare(b.name)),
    [],
  );
}

export function useCryostat(id: string): LocalCryostat | null | undefined {
  return useLiveQuery(async () => (await localDb().cryostats.get(id)) ?? null, [id]);
}

export function useTemplates(): LocalTemplate[] | undefined {
  return useLiveQuery(async () => localDb().templates.toArray(), []);
}

/** Everyone this user may see (id → name), for "by whom" lines. */
export function useUserNames(): Record<string, string> {
  const rows = useLiveQuery(async () => localDb().users.toArray(), []);
  // The same object while the people are the same, so rows drawn with it need not redraw.
  const key = (rows ?? []).map((u) => `${u.id}\u0000${u.name}`).join("\u0001");
  // Built from the key alone, so it changes exactly when the key does.
  return useMemo(
    () => Object.fromEntries(key ? key.split("\u0001").map((row) => row.split("\u0000", 2) as [string, string]) : []),
    [key],
  );
}

export function useUsers(): LocalUser[] | undefined {
  return useLiveQuery(async () => localDb().users.toArray(), []);
}

/** The facility rules in force, as last pulled (null: none set or not pulled yet). */
export function useFacilityRules<T = Record<string, unknown>>(): T | null | undefined {
  return useLiveQuery(async () => ((await localDb().getMeta("rules")) as T | null | undefined) ?? null, []);
}

export function useSyncSummary(): SyncSummary | undefined {
  return useLiveQuery(() => syncSummary(localDb()), []);
}

/** An object URL for a photo kept on the tablet, else the server's copy. */
export function useAttachmentUrl(id: string | undefined): string | undefined {
  const local = useLiveQuery(async () => (id ? ((await localDb().attachments.get(id)) ?? null) : null), [id]);
  const [url, setUrl] = useState<string | undefined>(undefined);
  useEffect(() => {
    if (!id || local === undefined) return;
    if (local) {
      const u = URL.createObjectURL(local.blob);
      setUrl(u);
      return () => URL.revokeObjectURL(u);
    }
    setUrl(`/api/attachments/${encodeURIComponent(id)}`);
    return undefined;
  }, [id, local]);
  return url;
}
