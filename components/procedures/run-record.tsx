"use client";
// The run record: every step in template order with everything written for it (readings,
// photos, notes, corrections with the original kept visible), every signature with its
// manifestation, and the run's start and end. Prints as a clean paper record.
import { SignatureManifestation } from "@/components/signature/manifestation";
import { Button } from "@/components/ui/button";
import { ROLE_LABEL } from "@/lib/auth/permissions";
import { formatDate, kindLabel } from "@/lib/format";
import { useCryostat } from "@/lib/local/hooks";
import { describeRange } from "@/lib/procedures/state";
import { personLabel } from "@/lib/record/people";
import { describeEntry, Photo } from "./step-bits";
import type { RunView } from "./use-run";

export function RunRecord({ view, names }: { view: RunView; names: Record<string, string> }) {
  const { state, template, start } = view;
  const cryostat = useCryostat(start.cryostatId ?? "");
  const sigsOn = (id: string) => state.signatures.filter((g) => g.signedEntryId === id);
  const who = (id: string) => personLabel(id, names);
  const ends = [state.completed?.entry, state.aborted?.entry].filter(Boolean);
  return (
    <article aria-label="Run record" className="run-record flex flex-col gap-4 print:gap-2 print:text-[11pt]">
      <div className="no-print flex justify-end">
        <Button onClick={() => window.print()}>Print the record</Button>
      </div>
      <header className="rounded-2xl border border-line bg-panel p-4 print:border-0 print:p-0">
        <h2 className="text-2xl font-bold">Run record — {state.startPayload?.title ?? template.title}</h2>
        <dl className="mt-2 grid grid-cols-1 gap-x-6 gap-y-1 sm:grid-cols-2 print:grid-cols-2">
          <div>
            <dt className="inline font-semibold">Procedure: </dt>
            <dd className="inline">
              {template.title} ({template.key}, version {template.version})
            </dd>
          </div>
          <div>
            <dt className="inline font-semibold">Cryostat: </dt>
            <dd className="inline">{cryostat?.name ?? start.cryostatId}</dd>
          </div>
          <div>
            <dt className="inline font-semibold">Started: </dt>
            <dd className="inline">
              {formatDate(start.recordedAt)} by {who(start.authorId)}
            </dd>
          </div>
          <div>
            <dt className="inline font-semibold">Status: </dt>
            <dd className="inline">
              {state.status === "open"
                ? "In progress"
                : state.status === "completed"
                  ? "Completed"
                  : `Aborted — ${state.aborted?.reason}`}
              {ends[0] ? `, ${formatDate(ends[0].recordedAt)} by ${who(ends[0].authorId)}` : ""}
            </dd>
          </div>
          <div>
            <dt className="inline font-semibold">Run id: </dt>
            <dd className="num inline text-sm">{state.runId}</dd>
          </div>
        </dl>
        {state.flags.length > 0 && (
          <ul className="mt-2 list-disc pl-5 text-warn">
            {state.flags.map((f) => (
              <li key={f}>{f}</li>
            ))}
          </ul>
        )}
      </header>

      <ol className="flex flex-col gap-3 print:gap-1">
        {state.steps.map((s) => (
          <li
            key={s.step.id}
            data-record-step={s.step.id}
            className="break-inside-avoid rounded-2xl border border-line bg-panel p-4 print:rounded-none print:border-x-0 print:border-t-0 print:p-1"
          >
            <h3 className="font-bold">
              <span className="num">{s.index + 1}.</span>{" "}
              {s.step.kind === "reading"
                ? `${s.step.quantity} (${describeRange(s.step)})`
                : s.step.kind === "hold"
                  ? `Hold point — signed by a ${ROLE_LABEL[s.step.role].toLowerCase()}`
                  : s.step.kind.charAt(0).toUpperCase() + s.step.kind.slice(1)}
              {s.status === "todo" || s.status === "blocked" ? (
                <span className="font-normal text-muted"> — not done</span>
              ) : null}
            </h3>
            <p className="text-muted">{s.step.text}</p>
            {s.problems.map((p) => (
              <p key={p} className="font-semibold text-warn">
                ⚑ {p}
              </p>
            ))}
            <ul className="mt-1 flex flex-col gap-1">
              {s.history.map((e) => {
                const p = e.payload;
                const replaced = !s.current.includes(e);
                return (
                  <li key={e.id} className="border-l-4 border-line pl-3">
                    <span className={replaced ? "line-through" : "font-semibold"}>{describeEntry(p)}</span>
                    {p.kind === "check" && p.secondPersonId ? ` — second person: ${who(p.secondPersonId)}` : ""}
                    <span className="text-sm text-muted">
                      {" "}
                      · {who(e.authorId)}, {formatDate(e.recordedAt)}, tablet {e.deviceId}
                    </span>
                    {replaced && (
                      <span className="block text-sm text-muted">
                        Replaced by a correction (kept here as recorded).
                      </span>
                    )}
                    {e.supersedes && <span className="block text-sm text-warn">Correction — reason: {e.reason}</span>}
                    {p.kind === "reading" && p.comment && <span className="block">Comment: {p.comment}</span>}
                    {p.kind === "photo" && <Photo id={p.attachmentId} />}
                    {sigsOn(e.id).map((g) => (
                      <div key={g.entryId} className="mt-1">
                        <SignatureManifestation sig={g} />
                      </div>
                    ))}
                  </li>
                );
              })}
            </ul>
          </li>
        ))}
      </ol>

      {ends.map(
        (e) =>
          e && (
            <section
              key={e.id}
              className="break-inside-avoid rounded-2xl border border-line bg-panel p-4 print:border-0 print:p-1"
            >
              <h3 className="font-bold">{kindLabel(e.kind)}</h3>
              <p className="text-sm text-muted">
                {who(e.authorId)}, {formatDate(e.recordedAt)}
              </p>
              {sigsOn(e.id).map((g) => (
                <div key={g.entryId} className="mt-1">
                  <SignatureManifestation sig={g} />
                </div>
              ))}
            </section>
          ),
      )}
      <p className="hidden text-sm print:block">
        Printed from Rimelog. Each signature is bound to the SHA-256 hash of the record it signs; the electronic record
        is the original.
      </p>
    </article>
  );
}
