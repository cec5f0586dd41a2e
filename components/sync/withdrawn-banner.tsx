"use client";
// The banner on every signed-in screen once the server has said this tablet was withdrawn by the
// facility admin: nothing more is sent from it, nothing on it is deleted, and who to ask.
import { Notice } from "@/components/ui/panel";
import { useSyncSummary } from "@/lib/local/hooks";

export function WithdrawnBanner() {
  const summary = useSyncSummary();
  const withdrawn = summary?.withdrawn;
  if (!withdrawn) return null;
  const pending = summary.pending;
  return (
    <div className="mx-auto max-w-6xl px-4 pb-2" data-testid="device-withdrawn">
      <Notice tone="danger" role="alert" title="This tablet has been withdrawn">
        <p>{withdrawn.message}</p>
        <p className="mt-1 font-semibold">
          {pending === 0
            ? "Nothing on this tablet is waiting to be sent."
            : `${pending} unsent ${pending === 1 ? "entry is" : "entries are"} kept on this tablet; do not clear it. Ask the facility admin.`}
        </p>
      </Notice>
    </div>
  );
}
