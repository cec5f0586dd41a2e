"use client";
// Small pieces shared by the run screen and the run record: one line per step entry, a photo.
import { trim } from "@/lib/format";
import { useAttachmentUrl } from "@/lib/local/hooks";
import type { RunStepPayload } from "@/lib/schemas/run";

export function describeEntry(p: RunStepPayload): string {
  switch (p.kind) {
    case "check":
      return "Ticked";
    case "reading":
      return `${trim(p.value, 6)} ${p.unit}${p.outOfRange ? " (out of range)" : ""}`;
    case "note":
      return p.text;
    case "photo":
      return "Photo taken";
    case "caution":
      return "Read";
    case "hold":
      return p.statement;
  }
}

export function Photo({ id }: { id: string }) {
  const url = useAttachmentUrl(id);
  return url ? <img src={url} alt="Photo for this step" className="mt-2 max-h-64 rounded-xl border border-line" /> : <span className="text-muted">Loading photo…</span>;
}

