"use client";
// Shift handover for one cryostat: the state summary from the tablet's log, a free-text note and
// open issues, signed "handed over" by the outgoing person; the incoming person (technician or
// researcher) accepts it with their own signature. Works offline through the tablet store.
import Link from "next/link";
import { useMemo, useState } from "react";
import { useMe } from "@/components/shell/use-me";
import { SignatureManifestation } from "@/components/signature/manifestation";
import { SignDialog } from "@/components/signature/sign-dialog";
import { writeSignature } from "@/components/signature/write-signature";
import { Button, buttonClass } from "@/components/ui/button";
import { ProblemNotice } from "@/components/ui/form";
import { Loading, Notice, Panel, Tag } from "@/components/ui/panel";
import { useQueryParams } from "@/components/ui/use-query-params";
import { formatDate, formatTemperature, stateLabel, trim } from "@/lib/format";
import { useCryostat, useEntries, useUserNames, useUsers } from "@/lib/local/hooks";
import { LocalWriteError, recordEntry, type StoredLocalEntry } from "@/lib/local/record";
import { type HandoverSummary, handoverSummary } from "@/lib/procedures/handover";
import { signaturesOf } from "@/lib/procedures/state";
import { isKind } from "@/lib/schemas/entry";

function errorText(e: unknown): string {
  return e instanceof LocalWriteError ? [e.message, ...e.problems].join(" ") : (e as Error).message;
}

export function HandoverPage() {
  const params = useQueryParams();
  if (!params) return <Loading />;
  const id = params.get("cryostat") ?? "";
  return id ? (
    <HandoverScreen cryostatId={id} />
  ) : (
    <Notice title="Choose a cryostat">Open the handover from the procedures page.</Notice>
  );
}

export function SummaryView({ s }: { s: HandoverSummary }) {
  return (
    <dl className="grid grid-cols-1 gap-x-6 gap-y-2 sm:grid-cols-2">
      <div>
        <dt className="text-sm text-muted">State</dt>
        <dd className="font-semibold">{stateLabel(s.state ?? null)}</dd>
      </div>
      <div>
        <dt className="text-sm text-muted">Stages (latest)</dt>
        <dd>
          {s.stages.length ? (
            <ul>
              {s.stages.map((st) => (
                <li key={st.stage}>
                  {st.stage}: <span className="num font-semibold">{formatTemperature(st.valueK, "K")}</span>{" "}
                  <span className="text-sm text-muted">({formatDate(st.at)})</span>
                </li>
              ))}
            </ul>
          ) : (
            "No stage readings"
          )}
        </dd>
      </div>
      {s.heliumPercent !== undefined && (
        <div>
          <dt className="text-sm text-muted">Helium</dt>
          <dd>
            <span className="num font-semibold">{trim(s.heliumPercent)} %</span>
            {s.heliumLitres !== undefined && <span className="num"> ≈ {trim(s.heliumLitres)} L</span>}
            {s.forecastDays !== undefined && (
              <span className="block text-sm">
                Minimum level in about {trim(s.forecastDays, 2)} days (estimate from the boil-off since the last fill)
              </span>
            )}
          </dd>
        </div>
      )}
      {s.fieldT !== undefined && (
        <div>
          <dt className="text-sm text-muted">Field</dt>
          <dd>
            <span className="num font-semibold">{trim(s.fieldT)} T</span>,{" "}
            {s.persistent ? "persistent mode" : "driven by the supply"}
          </dd>
        </div>
      )}
      <div>
        <dt className="text-sm text-muted">Open runs</dt>
        <dd>{s.openRuns.length ? s.openRuns.join("; ") : "None"}</dd>
      </div>
      <div>
        <dt className="text-sm text-muted">Open issues</dt>
        <dd>{s.openIssues.length ? s.openIssues.join("; ") : "None"}</dd>
      </div>
    </dl>
  );
}

function HandoverScreen({ cryostatId }: { cryostatId: string }) {
  const { me } = useMe();
  const cryostat = useCryostat(cryostatId);
  const entries = useEntries({ cryostatId });
  const users = useUsers();
  const names = useUserNames();
  const [note, setNote] = useState("");
  const [issues, setIssues] = useState<string | null>(null);
  const [to, setTo] = useState("");
  const [signing, setSigning] = useState<null | { kind: "give" } | { kind: "accept"; entry: StoredLocalEntry }>(null);
  const [error, setError] = useState<string | null>(null);

  const summary = useMemo(
    () =>
      entries && cryostat
        ? handoverSummary(
            entries.filter((e) => e.sync !== "rejected"),
            cryostat.config,
          )
        : null,
    [entries, cryostat],
  );
  const past = useMemo(() => {
    if (!entries) return [];
    const sigs = signaturesOf(entries);
    return entries
      .filter((e) => isKind(e, "handover"))
      .slice(0, 6)
      .map((e) => ({ entry: e, sigs: sigs.filter((g) => g.signedEntryId === e.id) }));
  }, [entries]);

  if (cryostat === undefined || entries === undefined || !summary)
    return <Loading label="Reading this cryostat's log on the tablet…" />;
  if (cryostat === null)
    return (
      <Notice tone="warn" title="Unknown cryostat">
        This tablet does not know that cryostat yet.
      </Notice>
    );
  const mayHand = me?.role === "technician" || me?.role === "researcher";
  const issueText = issues ?? summary.openIssues.join("\n");
  const incoming = (users ?? []).filter(
    (u) => u.active && u.id !== me?.id && (u.role === "technician" || u.role === "researcher"),
  );

  return (
    <div className="flex flex-col gap-4">
      <div className="flex flex-wrap items-center justify-between gap-2">
        <h1 className="text-3xl font-bold">Shift handover — {cryostat.name}</h1>
        <Link href="/procedures" className={buttonClass("ghost", "text-accent")}>
          ← Procedures
        </Link>
      </div>
      {error && <ProblemNotice tone="danger" title="Not saved" problems={[error]} />}
      <Panel aria-labelledby="summary-title">
        <h2 id="summary-title" className="mb-2 text-xl font-bold">
          State now
        </h2>
        <SummaryView s={summary} />
      </Panel>
      {mayHand && me && (
        <Panel className="flex flex-col gap-3">
          <h2 className="text-xl font-bold">Hand over</h2>
          <label className="flex flex-col gap-1 font-semibold">
            Note for the next shift
            <textarea
              value={note}
              onChange={(e) => setNote(e.target.value)}
              rows={4}
              className="rounded-xl border-2 border-line bg-bg px-3 py-2 text-lg"
            />
          </label>
          <label className="flex flex-col gap-1 font-semibold">
            Open issues (one per line)
            <textarea
              value={issueText}
              onChange={(e) => setIssues(e.target.value)}
              rows={2}
              className="rounded-xl border-2 border-line bg-bg px-3 py-2 text-lg"
            />
          </label>
          <label className="flex max-w-md flex-col gap-1 font-semibold">
            Handed over to
            <select
              value={to}
              onChange={(e) => setTo(e.target.value)}
              className="min-h-12 rounded-xl border-2 border-line bg-bg px-3 text-lg"
            >
              <option value="">Choose…</option>
              {incoming.map((u) => (
                <option key={u.id} value={u.id}>
                  {u.name}
                </option>
              ))}
            </select>
          </label>
          <Button
            variant="primary"
            className="min-h-16 self-start text-xl"
            disabled={!note.trim() || !to}
            onClick={() => setSigning({ kind: "give" })}
          >
            ✍ Hand over and sign
          </Button>
        </Panel>
      )}
      <section aria-labelledby="past-title" className="flex flex-col gap-3">
        <h2 id="past-title" className="text-xl font-bold">
          Recent handovers
        </h2>
        {past.length === 0 && <p className="text-muted">None on this tablet.</p>}
        {past.map(({ entry, sigs }) => {
          const p = entry.payload;
          const accepted = sigs.some((g) => g.meaning === "accepted" && g.valid);
          const mayAccept =
            mayHand && me && me.id !== entry.authorId && (!p.toUserId || p.toUserId === me.id) && !accepted;
          return (
            <Panel key={entry.id} data-handover={entry.id} className="flex flex-col gap-2">
              <p className="font-semibold">
                {names[entry.authorId] ?? entry.authorId} →{" "}
                {p.toUserId ? (names[p.toUserId] ?? p.toUserId) : "next shift"} · {formatDate(entry.recordedAt)}{" "}
                {accepted ? <Tag tone="ok">Accepted</Tag> : <Tag tone="accent">Not yet accepted</Tag>}
              </p>
              <p className="whitespace-pre-wrap">{p.note}</p>
              {/* Older handovers may carry a partial summary (written before the schema filled its
                  defaults, whatever the type says): fill the lists before showing it. */}
              {(p.summary?.stages?.length ?? 0) > 0 && (
                <SummaryView
                  s={{
                    ...p.summary,
                    stages: p.summary.stages ?? [],
                    openRuns: p.summary.openRuns ?? [],
                    openIssues: p.summary.openIssues ?? [],
                  }}
                />
              )}
              {sigs.map((g) => (
                <SignatureManifestation key={g.entryId} sig={g} />
              ))}
              {mayAccept && (
                <Button
                  variant="primary"
                  className="min-h-14 self-start"
                  onClick={() => setSigning({ kind: "accept", entry })}
                >
                  ✍ Accept and sign
                </Button>
              )}
            </Panel>
          );
        })}
      </section>
      {signing && me && (
        <SignDialog
          me={me}
          meaning={signing.kind === "give" ? "handed_over" : "accepted"}
          title={signing.kind === "give" ? "Sign the handover" : "Accept the handover"}
          onClose={() => setSigning(null)}
          onSign={async (c) => {
            setError(null);
            try {
              if (signing.kind === "give") {
                const openIssues = issueText
                  .split("\n")
                  .map((l) => l.trim())
                  .filter(Boolean);
                const h = await recordEntry({
                  cryostatId,
                  kind: "handover",
                  payload: { summary: { ...summary, openIssues }, note: note.trim(), toUserId: to },
                });
                await writeSignature(h, me, "handed_over", c);
                setNote("");
                setIssues(null);
              } else {
                await writeSignature(signing.entry, me, "accepted", c);
              }
            } catch (e) {
              throw new Error(errorText(e));
            }
          }}
        >
          <p>
            {signing.kind === "give"
              ? "I hand over this cryostat in the state shown, with the note and open issues written."
              : "I accept this cryostat in the state handed over."}
          </p>
        </SignDialog>
      )}
    </div>
  );
}
