"use client";
// A cryostat's logbook: its entries, newest first, a page at a time.
import Link from "next/link";
import { useCallback, useEffect, useState } from "react";
import { Button } from "@/components/ui/button";
import { Loading, Notice, Panel } from "@/components/ui/panel";
import type { StoredEntry } from "@/lib/schemas/entry";
import { kindLabel } from "@/lib/format";
import { EntryBody, EntryMeta } from "./entry-body";

type Page = { entries: StoredEntry[]; names: Record<string, string>; nextCursor: number | null };

export function CryostatLogbook({ cryostatId }: { cryostatId: string }) {
  const [entries, setEntries] = useState<StoredEntry[]>([]);
  const [names, setNames] = useState<Record<string, string>>({});
  const [cursor, setCursor] = useState<number | null | undefined>(undefined);
  const [error, setError] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);

  const load = useCallback(
    async (from?: number) => {
      setBusy(true);
      setError(null);
      try {
        const r = await fetch(`/api/cryostats/${encodeURIComponent(cryostatId)}/entries${from ? `?cursor=${from}` : ""}`, { cache: "no-store" });
        const body = await r.json();
        if (!r.ok) throw new Error(body?.error?.message ?? `The server answered ${r.status}.`);
        const page = body as Page;
        setEntries((old) => (from ? [...old, ...page.entries] : page.entries));
        setNames((old) => ({ ...old, ...page.names }));
        setCursor(page.nextCursor);
      } catch (e) {
        setError((e as Error).message.includes("fetch") ? "No connection to the server." : (e as Error).message);
      } finally {
        setBusy(false);
      }
    },
    [cryostatId],
  );

  useEffect(() => {
    void load();
  }, [load]);

  const title = cryostatId.charAt(0).toUpperCase() + cryostatId.slice(1);
  return (
    <div className="flex flex-col gap-4">
      <div className="flex flex-wrap items-center justify-between gap-2">
        <h1 className="text-3xl font-bold">{title} logbook</h1>
        <Link href="/" className="flex min-h-12 items-center rounded-xl px-4 font-semibold text-accent hover:bg-sunk">
          ← Room
        </Link>
      </div>
      {error && (
        <Notice tone="danger" title="Could not load the logbook" role="alert">
          <p className="mb-2">{error}</p>
          <Button onClick={() => void load(cursor ?? undefined)}>Try again</Button>
        </Notice>
      )}
      {cursor === undefined && !error ? (
        <Loading label="Loading entries…" />
      ) : (
        <Panel className="p-0">
          <ol aria-label="Entries, newest first">
            {entries.map((e) => (
              <li key={e.id} className="flex flex-col gap-1 border-b border-line px-5 py-3 last:border-0 sm:flex-row sm:gap-4">
                <div className="sm:w-56 sm:shrink-0">
                  <span className="block font-semibold">{kindLabel(e.kind)}</span>
                  <EntryMeta entry={e} names={names} />
                </div>
                <div className="min-w-0 flex-1">
                  <EntryBody entry={e} names={names} />
                  {e.supersedes && <p className="text-sm text-warn">Corrects an earlier entry: {e.reason}</p>}
                </div>
              </li>
            ))}
            {entries.length === 0 && <li className="px-5 py-6 text-muted">No entries yet.</li>}
          </ol>
        </Panel>
      )}
      {cursor ? (
        <Button onClick={() => void load(cursor)} disabled={busy} className="self-center">
          {busy ? "Loading…" : "Show older entries"}
        </Button>
      ) : null}
    </div>
  );
}
