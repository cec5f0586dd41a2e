"use client";
// Small pieces shared by the run screen and the run record: one line per step entry, a photo.
import { useAttachmentUrl } from "@/lib/local/hooks";

export { describeEntry } from "@/lib/procedures/describe";

export function Photo({ id }: { id: string }) {
  const url = useAttachmentUrl(id);
  return url ? (
    <img src={url} alt="Photo for this step" className="mt-2 max-h-64 rounded-xl border border-line" />
  ) : (
    <span className="text-muted">Loading photo…</span>
  );
}
