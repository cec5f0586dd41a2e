"use client";
// A cryostat's logbook from the tablet store: pulled entries and this tablet's unsent ones,
// newest first, each marked with where it stands (sent / waiting / refused with the reason).
import { memo, useState } from "react";
import { Button } from "@/components/ui/button";
import { Loading, Panel, Tag } from "@/components/ui/panel";
import { kindLabel } from "@/lib/format";
import type { StoredLocalEntry } from "@/lib/local/db";
import { useEntries, useUserNames } from "@/lib/local/hooks";
import { EntryBody, EntryMeta } from "./entry-body";

const PAGE = 40;

export function CryostatLogbook({ cryostatId }: { cryostatId: string }) {
  const [limit, setLimit] = useState(PAGE);
  const entries = useEntries({ cryostatId, limit: limit + 1 });
  const names = useUserNames();
  if (entries === undefined) return <Loading label="Loading entries…" />;
  const shown = entries.slice(0, limit);
  return (
    <section aria-labelledby="logbook-title" className="flex flex-col gap-3">
      <h2 id="logbook-title" className="text-xl font-bold">
        Logbook
      </h2>
      <Panel className="p-0">
        <ol aria-label="Entries, newest first">
          {shown.map((e) => (
            <EntryRow key={e.id} e={e} names={names} />
          ))}
          {shown.length === 0 && <li className="px-5 py-6 text-muted">No entries yet.</li>}
        </ol>
      </Panel>
      {entries.length > limit && (
        <Button onClick={() => setLimit((l) => l + PAGE)} className="self-center">
          Show older entries
        </Button>
      )}
    </section>
  );
}

/**
 * A row redraws only when its entry's state changed (a live query hands over fresh objects on
 * every write, and a new entry must not redraw the forty rows below it).
 */
const EntryRow = memo(
  EntryRowView,
  (a, b) =>
    a.names === b.names &&
    a.e.id === b.e.id &&
    a.e.sync === b.e.sync &&
    a.e.seq === b.e.seq &&
    a.e.rejection?.message === b.e.rejection?.message,
);

function EntryRowView({ e, names }: { e: StoredLocalEntry; names: Record<string, string> }) {
  return (
    <li
      data-sync={e.sync}
      className={`flex flex-col gap-1 border-b border-line px-5 py-3 last:border-0 sm:flex-row sm:gap-4 ${e.sync === "rejected" ? "bg-sunk" : ""}`}
    >
      <div className="sm:w-56 sm:shrink-0">
        <span className="block font-semibold">{kindLabel(e.kind)}</span>
        <EntryMeta entry={e} names={names} />
        {e.sync === "pending" && (
          <span className="mt-1 block">
            <Tag tone="accent">Not sent yet</Tag>
          </span>
        )}
        {e.sync === "rejected" && (
          <span className="mt-1 block">
            <Tag tone="danger">Refused</Tag>
          </span>
        )}
      </div>
      <div className="min-w-0 flex-1">
        <EntryBody entry={e} names={names} />
        {e.supersedes && <p className="text-sm text-warn">Corrects an earlier entry: {e.reason}</p>}
        {e.sync === "rejected" && e.rejection && (
          <p role="note" className="mt-1 text-sm font-semibold text-danger">
            The server refused this entry: {e.rejection.message} It stays on this tablet only; record it again with the
            problem fixed.
          </p>
        )}
      </div>
    </li>
  );
}
