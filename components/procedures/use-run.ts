"use client";
// A run as the tablet sees it: its entries from the tablet store (unsent ones included, so a tick
// shows at once), its pinned template, and the state derived from them.
import { useMemo } from "react";
import { type LocalTemplate, useEntries, useEntry, useTemplates } from "@/lib/local/hooks";
import type { StoredLocalEntry } from "@/lib/local/record";
import { deriveRun, type RunState } from "@/lib/procedures/state";
import type { RunStartPayload } from "@/lib/schemas/run";

export type RunView = {
  state: RunState;
  template: LocalTemplate;
  start: StoredLocalEntry;
  entries: StoredLocalEntry[];
  rejected: StoredLocalEntry[];
};

/** undefined: loading; null: this tablet does not know the run (or its template) yet. */
export function useRun(runId: string | undefined): RunView | null | undefined {
  const start = useEntry(runId);
  const list = useEntries(runId ? { runId } : { kinds: ["__none__"] });
  const templates = useTemplates();
  return useMemo(() => {
    if (!runId) return null;
    if (start === undefined || list === undefined || templates === undefined) return undefined;
    if (start?.kind !== "run.start") return null;
    const p = start.payload as RunStartPayload;
    const template = templates.find((t) => t.id === p.templateId);
    if (!template) return null;
    const all = [start, ...list.filter((e) => e.id !== start.id)];
    // A refused entry is shown with its reason but never counts as done.
    const kept = all.filter((e) => e.sync !== "rejected");
    return {
      state: deriveRun(runId, template, kept),
      template,
      start,
      entries: all,
      rejected: all.filter((e) => e.sync === "rejected"),
    };
  }, [runId, start, list, templates]);
}
