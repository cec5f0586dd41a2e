"use client";
// The procedures start page: runs in progress, the procedures that fit each cryostat (newest
// template version), finished runs, the signing PIN and the shift handover. All from the tablet
// store, so it works with no network once the tablet has synced.
import Link from "next/link";
import { useMemo, useState } from "react";
import { useMe } from "@/components/shell/use-me";
import { PinPanel } from "@/components/signature/pin-panel";
import { Button, buttonClass } from "@/components/ui/button";
import { ProblemNotice } from "@/components/ui/form";
import { Loading, Notice, Panel, Tag } from "@/components/ui/panel";
import { formatDate } from "@/lib/format";
import { type LocalTemplate, useCryostats, useEntries, useTemplates, useUserNames } from "@/lib/local/hooks";
import { recordEntry } from "@/lib/local/record";
import { isKind } from "@/lib/schemas/entry";
import { errorText } from "./run/context";

/** Newest version of each template key. */
export function latestOfEach(templates: LocalTemplate[]): LocalTemplate[] {
  const best = new Map<string, LocalTemplate>();
  for (const t of templates) if ((best.get(t.key)?.version ?? 0) < t.version) best.set(t.key, t);
  return [...best.values()].sort((a, b) => a.title.localeCompare(b.title));
}

export function ProceduresHome() {
  const { me } = useMe();
  const cryostats = useCryostats();
  const templates = useTemplates();
  const runEntries = useEntries({ kinds: ["run.start", "run.abort", "run.complete"] });
  const names = useUserNames();
  const [error, setError] = useState<string | null>(null);
  const [busy, setBusy] = useState<string | null>(null);
  /** The procedure chosen but not yet started: one more tap confirms (a mis-tap starts nothing). */
  const [confirming, setConfirming] = useState<{ t: LocalTemplate; cryostatId: string; cryostatName: string } | null>(
    null,
  );

  const runs = useMemo(() => {
    const ended = new Map(
      (runEntries ?? [])
        .filter((e) => e.kind !== "run.start" && e.runId && e.sync !== "rejected")
        .map((e) => [e.runId!, e.kind]),
    );
    return (runEntries ?? [])
      .filter((e) => isKind(e, "run.start"))
      .filter((e) => e.sync !== "rejected")
      .map((e) => ({ entry: e, payload: e.payload, ended: ended.get(e.id) ?? null }))
      .sort((a, b) => b.entry.recordedAt.localeCompare(a.entry.recordedAt));
  }, [runEntries]);

  if (!cryostats || !templates || !runEntries) return <Loading label="Loading procedures from this tablet…" />;
  const latest = latestOfEach(templates);
  const open = runs.filter((r) => !r.ended);
  const finished = runs.filter((r) => r.ended).slice(0, 12);
  const mayStart = me?.role === "technician" || me?.role === "researcher";
  const nameOf = (id: string | null) => cryostats.find((c) => c.id === id)?.name ?? id ?? "";

  async function start(t: LocalTemplate, cryostatId: string, cryostatName: string) {
    setBusy(`${t.id}:${cryostatId}`);
    setError(null);
    try {
      const e = await recordEntry({
        cryostatId,
        kind: "run.start",
        payload: {
          templateId: t.id,
          templateKey: t.key,
          templateVersion: t.version,
          title: `${t.title} — ${cryostatName}`,
        },
      });
      // A full navigation: the one cached /runs page opens it even with no network.
      window.location.assign(`/runs?id=${e.id}`);
    } catch (err) {
      setError(errorText(err));
      setBusy(null);
    }
  }

  return (
    <div className="flex flex-col gap-5">
      {error && <ProblemNotice tone="danger" title="Not started" problems={[error]} />}
      <section aria-labelledby="open-runs">
        <h2 id="open-runs" className="mb-2 text-2xl font-bold">
          In progress
        </h2>
        {open.length === 0 ? (
          <p className="text-muted">No procedure is running.</p>
        ) : (
          <ul className="grid gap-3 md:grid-cols-2">
            {open.map((r) => (
              <li key={r.entry.id}>
                <Link
                  href={`/runs?id=${r.entry.id}`}
                  className="flex min-h-20 flex-col justify-center rounded-2xl border-2 border-accent bg-panel px-5 py-3 hover:bg-sunk"
                >
                  <span className="text-lg font-bold">{r.payload.title}</span>
                  <span className="text-muted">
                    {nameOf(r.entry.cryostatId)} · started {formatDate(r.entry.recordedAt)} by{" "}
                    {names[r.entry.authorId] ?? r.entry.authorId}
                  </span>
                </Link>
              </li>
            ))}
          </ul>
        )}
      </section>

      <section aria-labelledby="start" className="flex flex-col gap-3">
        <h2 id="start" className="text-2xl font-bold">
          Start a procedure
        </h2>
        {!mayStart && (
          <p className="text-muted">
            Technicians and researchers start procedures; you can open any run and its record.
          </p>
        )}
        <div className="grid gap-3 lg:grid-cols-3">
          {cryostats.map((c) => (
            <Panel key={c.id} aria-labelledby={`cry-${c.id}`} className="flex flex-col gap-2">
              <h3 id={`cry-${c.id}`} className="text-xl font-bold">
                {c.name} <span className="text-base font-normal text-muted">{c.location}</span>
              </h3>
              {latest
                .filter((t) => t.cryostatKinds.includes(c.kind))
                .map((t) => (
                  <Button
                    key={t.id}
                    variant="secondary"
                    disabled={!mayStart || busy !== null}
                    onClick={() => setConfirming({ t, cryostatId: c.id, cryostatName: c.name })}
                    className="justify-start text-left"
                    aria-label={`Start ${t.title} on ${c.name}`}
                  >
                    ▶ {t.title} <span className="num ml-auto text-sm text-muted">v{t.version}</span>
                  </Button>
                ))}
              {confirming?.cryostatId === c.id && (
                <ConfirmStart
                  title={confirming.t.title}
                  cryostatName={c.name}
                  duplicates={open.filter(
                    (r) => r.entry.cryostatId === c.id && r.payload.templateKey === confirming.t.key,
                  )}
                  busy={busy !== null}
                  onStart={() => void start(confirming.t, c.id, c.name)}
                  onCancel={() => setConfirming(null)}
                />
              )}
              <Link
                href={`/handover?cryostat=${encodeURIComponent(c.id)}`}
                className={buttonClass("ghost", "justify-start text-accent")}
              >
                Shift handover for {c.name} →
              </Link>
            </Panel>
          ))}
        </div>
      </section>

      {finished.length > 0 && (
        <section aria-labelledby="finished">
          <h2 id="finished" className="mb-2 text-2xl font-bold">
            Finished runs
          </h2>
          <ul className="flex flex-col gap-2">
            {finished.map((r) => (
              <li key={r.entry.id}>
                <Link
                  href={`/runs?id=${r.entry.id}&view=record`}
                  className="flex min-h-12 flex-wrap items-center gap-2 rounded-xl border border-line bg-panel px-4 py-2 hover:bg-sunk"
                >
                  <span className="font-semibold">{r.payload.title}</span>
                  <Tag tone={r.ended === "run.complete" ? "ok" : "danger"}>
                    {r.ended === "run.complete" ? "Completed" : "Aborted"}
                  </Tag>
                  <span className="text-sm text-muted">{formatDate(r.entry.recordedAt)}</span>
                </Link>
              </li>
            ))}
          </ul>
        </section>
      )}
      {me && <PinPanel me={me} />}
    </div>
  );
}

/** One more tap before a run starts, with a warning when the same procedure is already open on this cryostat. */
function ConfirmStart({
  title,
  cryostatName,
  duplicates,
  busy,
  onStart,
  onCancel,
}: {
  title: string;
  cryostatName: string;
  duplicates: { entry: { id: string; recordedAt: string } }[];
  busy: boolean;
  onStart: () => void;
  onCancel: () => void;
}) {
  return (
    <div
      role="dialog"
      aria-label={`Start ${title}?`}
      className="flex flex-col gap-2 rounded-xl border-2 border-accent p-3"
    >
      <p className="font-semibold">
        Start “{title}” on {cryostatName} now?
      </p>
      {duplicates.length > 0 && (
        <Notice tone="warn" title="Already running">
          This procedure is already in progress on {cryostatName} (started {formatDate(duplicates[0]!.entry.recordedAt)}
          ). Open that run instead, unless a second one is really meant.{" "}
          <Link href={`/runs?id=${duplicates[0]!.entry.id}`} className="underline">
            Open the running one
          </Link>
        </Notice>
      )}
      <div className="flex flex-wrap gap-2">
        <Button variant="primary" className="min-h-14" disabled={busy} onClick={onStart}>
          {duplicates.length ? "Start a second run" : "Yes, start"}
        </Button>
        <Button variant="ghost" className="min-h-14" onClick={onCancel}>
          Cancel
        </Button>
      </div>
    </div>
  );
}
