"use client";
// Always-visible sync state in the header: online/offline, how many entries wait to be sent,
// when the last sync succeeded, refused entries (with the reason and what to do), whether the
// browser keeps storage, and a prompt when a new version of the app is ready.
import { useEffect, useRef, useState } from "react";
import { Button } from "@/components/ui/button";
import { formatDate, formatWhen, kindLabel } from "@/lib/format";
import { useSyncSummary } from "@/lib/local/hooks";
import { syncLoop, useLoopState } from "./runtime";
import { usePersistentStorage, useServiceWorker } from "./sw-register";

function useNow(ms = 30_000): number {
  const [now, setNow] = useState(() => Date.now());
  useEffect(() => {
    const t = setInterval(() => setNow(Date.now()), ms);
    return () => clearInterval(t);
  }, [ms]);
  return now;
}

export function SyncIndicator() {
  const summary = useSyncSummary();
  const loop = useLoopState();
  const persist = usePersistentStorage();
  const { updateReady, applyUpdate } = useServiceWorker();
  const [open, setOpen] = useState(false);
  const now = useNow();
  const panel = useRef<HTMLDivElement>(null);

  useEffect(() => {
    if (!open) return;
    const close = (e: PointerEvent) =>
      panel.current && !panel.current.parentElement?.contains(e.target as Node) && setOpen(false);
    document.addEventListener("pointerdown", close);
    return () => document.removeEventListener("pointerdown", close);
  }, [open]);

  const pending = summary?.pending ?? 0;
  const rejected = summary?.rejected.length ?? 0;
  const waitingPhotos = summary?.pendingAttachments ?? 0;
  const tone =
    rejected > 0
      ? "border-danger text-danger"
      : !loop.online
        ? "border-warn text-warn"
        : pending > 0
          ? "border-accent text-accent"
          : "border-ok text-ok";
  const last = summary?.lastSuccess ? formatWhen(summary.lastSuccess, now) : "never";

  return (
    <div className="relative flex items-center gap-2">
      {updateReady && (
        <Button variant="primary" onClick={applyUpdate} title="A new version of Rimelog is ready">
          New version: reload
        </Button>
      )}
      <button
        type="button"
        onClick={() => setOpen((o) => !o)}
        aria-expanded={open}
        aria-controls="sync-details"
        data-testid="sync-indicator"
        data-pending={summary ? pending : undefined}
        data-online={loop.online ? "yes" : "no"}
        className={`flex min-h-12 items-center gap-2 rounded-xl border-2 bg-panel px-3 text-left leading-tight ${tone}`}
      >
        <span
          aria-hidden
          className={`inline-block h-3 w-3 rounded-full ${loop.online ? "bg-current" : "border-2 border-current"}`}
        />
        <span role="status" aria-live="polite" aria-label="Sync status">
          <span className="block font-semibold">
            {loop.online ? "Online" : "Offline"} · {pending === 0 ? "nothing to send" : `${pending} to send`}
            {rejected > 0 && ` · ${rejected} refused`}
          </span>
          <span className="block text-sm text-muted">{loop.running ? "Syncing…" : `Last sync ${last}`}</span>
        </span>
      </button>
      {open && (
        <div
          ref={panel}
          id="sync-details"
          role="dialog"
          aria-label="Sync details"
          className="absolute right-0 top-full z-30 mt-2 w-[min(28rem,90vw)] rounded-2xl border border-line bg-panel p-4 text-ink shadow-lg"
        >
          <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1">
            <dt className="text-muted">Network</dt>
            <dd>{loop.online ? "Online" : "Offline — everything you record is kept on this tablet"}</dd>
            <dt className="text-muted">Waiting to send</dt>
            <dd className="num">
              {pending} {pending === 1 ? "entry" : "entries"}
              {waitingPhotos > 0 && `, ${waitingPhotos} photo${waitingPhotos === 1 ? "" : "s"}`}
            </dd>
            <dt className="text-muted">Last sync</dt>
            <dd>{summary?.lastSuccess ? `${formatDate(summary.lastSuccess)} (${last})` : "not yet"}</dd>
            {summary?.lastError && (
              <>
                <dt className="text-muted">Last problem</dt>
                <dd className="text-warn">{summary.lastError.message}</dd>
              </>
            )}
            {loop.nextRetryAt && (
              <>
                <dt className="text-muted">Next try</dt>
                <dd>{formatWhen(new Date(loop.nextRetryAt).toISOString(), now).replace(" ago", "")}</dd>
              </>
            )}
            <dt className="text-muted">Storage</dt>
            <dd>
              {persist === "granted"
                ? "Kept: the browser will not clear it"
                : persist === "denied"
                  ? "Not guaranteed: the browser may clear it when space runs low — sync often"
                  : persist === "unsupported"
                    ? "This browser cannot promise to keep it — sync often"
                    : "Checking…"}
            </dd>
          </dl>
          {rejected > 0 && summary && (
            <div className="mt-3 rounded-xl border-2 border-danger p-3">
              <p className="font-semibold text-danger">Refused by the server</p>
              <p className="mb-2 text-sm">
                These stay on this tablet and are not in the shared log. Record each again with the problem fixed, or
                show it to the facility admin.
              </p>
              <ul className="flex flex-col gap-2">
                {summary.rejected.map((e) => (
                  <li key={e.id} className="border-t border-line pt-2 text-sm">
                    <span className="font-semibold">{kindLabel(e.kind)}</span>
                    {e.cryostatId && ` · ${e.cryostatId}`} · {formatDate(e.recordedAt)}
                    <span className="block text-danger">{e.rejection?.message}</span>
                  </li>
                ))}
              </ul>
            </div>
          )}
          {summary && summary.rejectedAttachments.length > 0 && (
            <ul className="mt-3 text-sm text-danger">
              {summary.rejectedAttachments.map((a) => (
                <li key={a.id}>
                  Photo {a.fileName}: {a.message}
                </li>
              ))}
            </ul>
          )}
          <Button className="mt-3 w-full" onClick={() => void syncLoop().run()} disabled={loop.running || !loop.online}>
            {loop.running ? "Syncing…" : "Sync now"}
          </Button>
        </div>
      )}
    </div>
  );
}
