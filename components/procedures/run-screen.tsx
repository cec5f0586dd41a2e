"use client";
// Running a procedure on the tablet: one step at a time (or the whole list), progress, readings
// on a big keypad checked against the pinned range as they are typed, notes and photos per step,
// hold points signed by the required role, abort with a reason, completion signed. Everything is
// written to the tablet store first; the run's state is derived from the log (use-run.ts).
import Link from "next/link";
import { useEffect, useState } from "react";
import { DerivedValue } from "@/components/cryo/derived-value";
import { Caution } from "@/components/safety/caution";
import { useMe } from "@/components/shell/use-me";
import { SignatureManifestation } from "@/components/signature/manifestation";
import { SignDialog } from "@/components/signature/sign-dialog";
import { writeSignature } from "@/components/signature/write-signature";
import { Button, buttonClass } from "@/components/ui/button";
import { Loading, Notice, Panel, Tag } from "@/components/ui/panel";
import { ROLE_LABEL, type Role } from "@/lib/auth/permissions";
import { formatDate } from "@/lib/format";
import { useCryostat, useUserNames, useUsers } from "@/lib/local/hooks";
import { LocalWriteError, putAttachment, recordEntry, type StoredLocalEntry } from "@/lib/local/record";
import { describeRange, type RunState, readingOutOfRange, type StepState } from "@/lib/procedures/state";
import type { RunStepPayload } from "@/lib/schemas/run";
import type { TemplateStep } from "@/lib/schemas/template";
import type { SessionUser } from "@/lib/schemas/user";
import { Keypad, keypadNumber } from "./keypad";
import { RunRecord } from "./run-record";
import { describeEntry, Photo } from "./step-bits";
import { type RunView, useRun } from "./use-run";

type Ctx = {
  view: RunView;
  me: SessionUser;
  cryostatId: string;
  onError: (m: string | null) => void;
  names: Record<string, string>;
};

const STATUS_LABEL: Record<
  StepState["status"],
  { text: string; tone: "neutral" | "ok" | "warn" | "danger" | "accent" }
> = {
  todo: { text: "To do", tone: "neutral" },
  done: { text: "Done", tone: "ok" },
  flagged: { text: "Done · flagged", tone: "warn" },
  awaiting_signature: { text: "Awaiting signature", tone: "accent" },
  blocked: { text: "Waits for hold point", tone: "neutral" },
};

export function errorText(e: unknown): string {
  if (e instanceof LocalWriteError) return [e.message, ...e.problems].join(" ");
  return (e as Error).message || "Nothing was saved.";
}

/** Which of the safety engineer's caution topics fits a template's caution step. */
export function cautionTopicFor(templateKey: string, topic: Extract<TemplateStep, { kind: "caution" }>["topic"]) {
  switch (topic) {
    case "cryogen":
      return "cold" as const;
    case "oxygen":
      return "oxygen" as const;
    case "transfer_line":
      return "transfer" as const;
    case "magnet":
      return "ramp" as const;
    default:
      return templateKey.startsWith("warmup") ? ("warmup" as const) : ("cooldown" as const);
  }
}

export function RunScreen({
  runId,
  initialView = "step",
}: {
  runId: string;
  initialView?: "step" | "list" | "record";
}) {
  const { me } = useMe();
  const view = useRun(runId);
  const [mode, setMode] = useState<"step" | "list" | "record">(initialView);
  const [index, setIndex] = useState<number | null>(null);
  const [error, setError] = useState<string | null>(null);
  const names = useUserNames();

  // Follow the work: open on the first step still to do, once the run is known.
  const current = view?.state.currentIndex ?? null;
  useEffect(() => {
    if (index === null && view) setIndex(current ?? 0);
  }, [index, view, current]);

  if (view === undefined) return <Loading label="Opening the run on this tablet…" />;
  if (view === null || !me)
    return (
      <Notice tone="warn" title="This run is not on this tablet yet">
        <p>
          It appears here after the tablet has synced once with the network (or open it on the tablet where it was
          started).
        </p>
        <Link href="/procedures" className={buttonClass("secondary", "mt-2")}>
          ← Procedures
        </Link>
      </Notice>
    );

  const { state, template, start } = view;
  const ctx: Ctx = { view, me, cryostatId: start.cryostatId ?? "", onError: setError, names };
  const at = Math.min(index ?? 0, state.steps.length - 1);
  const s = state.steps[at];

  return (
    <div className="flex flex-col gap-4">
      <RunHeader
        state={state}
        title={String(state.startPayload?.title ?? template.title)}
        version={template.version}
        cryostatId={ctx.cryostatId}
        mode={mode}
        setMode={setMode}
      />
      {error && (
        <Notice tone="danger" title="Not saved" role="alert">
          <p>{error}</p>
        </Notice>
      )}
      {view.rejected.length > 0 && (
        <Notice tone="danger" title="Refused by the server" role="alert">
          <ul className="list-disc pl-5">
            {view.rejected.map((e) => (
              <li key={e.id}>
                {e.kind}: {e.rejection?.message}
              </li>
            ))}
          </ul>
        </Notice>
      )}
      {state.flags.length > 0 && mode !== "record" && (
        <Notice tone="warn" title="Flags on this run">
          <ul className="list-disc pl-5">
            {state.flags.map((f) => (
              <li key={f}>{f}</li>
            ))}
          </ul>
        </Notice>
      )}

      {mode === "record" ? (
        <RunRecord view={view} names={names} />
      ) : mode === "list" ? (
        <ol aria-label="Steps" className="flex flex-col gap-3">
          {state.steps.map((st) => (
            <li key={st.step.id}>
              <StepCard
                s={st}
                ctx={ctx}
                total={state.steps.length}
                compact={st.index !== at}
                onOpen={() => setIndex(st.index)}
              />
            </li>
          ))}
        </ol>
      ) : s ? (
        <>
          <StepCard s={s} ctx={ctx} total={state.steps.length} />
          <nav aria-label="Steps" className="no-print flex flex-wrap items-center gap-2">
            <Button
              onClick={() => setIndex(Math.max(0, at - 1))}
              disabled={at === 0}
              className="min-h-14 flex-1 text-lg"
            >
              ← Previous step
            </Button>
            {current !== null && current !== at && (
              <Button onClick={() => setIndex(current)} className="min-h-14 flex-1 text-lg">
                Go to step {current + 1}
              </Button>
            )}
            <Button
              variant="primary"
              onClick={() => setIndex(Math.min(state.steps.length - 1, at + 1))}
              disabled={at >= state.steps.length - 1}
              className="min-h-14 flex-1 text-lg"
            >
              Next step →
            </Button>
          </nav>
        </>
      ) : null}

      {state.status === "open" && mode !== "record" && <RunEnd ctx={ctx} state={state} />}
      {state.completed &&
        !state.signatures.some(
          (g) => g.valid && g.meaning === "performed" && g.signedEntryId === state.completed?.entry.id,
        ) && <SignCompletion ctx={ctx} entry={state.completed.entry as StoredLocalEntry} />}
    </div>
  );
}

function RunHeader({
  state,
  title,
  version,
  cryostatId,
  mode,
  setMode,
}: {
  state: RunState;
  title: string;
  version: number;
  cryostatId: string;
  mode: string;
  setMode: (m: "step" | "list" | "record") => void;
}) {
  const cryostat = useCryostat(cryostatId);
  const { done, required, percent } = state.progress;
  return (
    <Panel className="no-print flex flex-col gap-3">
      <div className="flex flex-wrap items-start justify-between gap-2">
        <div>
          <h1 className="text-2xl font-bold sm:text-3xl">{title}</h1>
          <p className="text-muted">
            {cryostat?.name ?? cryostatId} · procedure version {version} ·{" "}
            {state.status === "open" ? (
              <Tag tone="accent">In progress</Tag>
            ) : state.status === "completed" ? (
              <Tag tone="ok">Completed</Tag>
            ) : (
              <Tag tone="danger">Aborted</Tag>
            )}
          </p>
        </div>
        <div role="tablist" aria-label="How to show the run" className="no-print flex flex-wrap gap-1">
          {(
            [
              ["step", "One step"],
              ["list", "All steps"],
              ["record", "Record"],
            ] as const
          ).map(([m, label]) => (
            <button
              type="button"
              key={m}
              role="tab"
              aria-selected={mode === m}
              onClick={() => setMode(m)}
              className={`min-h-12 rounded-xl border-2 px-4 font-semibold ${mode === m ? "border-accent bg-sunk" : "border-line"}`}
            >
              {label}
            </button>
          ))}
        </div>
      </div>
      <div>
        <div className="flex justify-between text-sm font-semibold">
          <span>
            Progress: <span className="num">{done}</span> of <span className="num">{required}</span> required steps
          </span>
          <span className="num">{percent} %</span>
        </div>
        <div
          role="progressbar"
          aria-label="Run progress"
          aria-valuemin={0}
          aria-valuemax={100}
          aria-valuenow={percent}
          className="mt-1 h-4 overflow-hidden rounded-full bg-sunk"
        >
          <div className="h-full rounded-full bg-accent" style={{ width: `${percent}%` }} />
        </div>
      </div>
    </Panel>
  );
}

function StepCard({
  s,
  ctx,
  total,
  compact = false,
  onOpen,
}: {
  s: StepState;
  ctx: Ctx;
  total: number;
  compact?: boolean;
  onOpen?: () => void;
}) {
  const st = STATUS_LABEL[s.status];
  const open = ctx.view.state.status === "open";
  return (
    <Panel
      data-step={s.step.id}
      data-status={s.status}
      aria-labelledby={`step-${s.step.id}`}
      className={`flex flex-col gap-3 border-2 ${s.status === "flagged" ? "border-warn" : "border-line"}`}
    >
      <div className="flex flex-wrap items-start justify-between gap-2">
        <h2 id={`step-${s.step.id}`} className="text-xl font-bold">
          <span className="num text-muted">
            {s.index + 1}/{total}
          </span>{" "}
          {stepHeading(s.step)}
        </h2>
        <Tag tone={st.tone}>{st.text}</Tag>
      </div>
      <p className="text-lg">{s.step.text}</p>
      {s.problems.map((p) => (
        <p key={p} className="font-semibold text-warn">
          ⚑ {p}
        </p>
      ))}
      {compact ? (
        <div className="flex flex-wrap items-center gap-2">
          <StepSummary s={s} names={ctx.names} />
          <Button onClick={onOpen} className="ml-auto">
            Open step
          </Button>
        </div>
      ) : (
        <>
          <StepEntries s={s} ctx={ctx} />
          {open && s.status !== "blocked" && <StepAction s={s} ctx={ctx} />}
          {open && s.status === "blocked" && (
            <Notice tone="neutral">This step waits for the hold point before it to be signed.</Notice>
          )}
        </>
      )}
    </Panel>
  );
}

function stepHeading(step: TemplateStep): string {
  switch (step.kind) {
    case "check":
      return step.secondPerson ? "Check (two people)" : "Check";
    case "reading":
      return step.quantity;
    case "hold":
      return `Hold point — ${ROLE_LABEL[step.role]} signs`;
    case "note":
      return "Note";
    case "photo":
      return "Photo";
    case "caution":
      return "Caution";
  }
}

function StepSummary({ s, names }: { s: StepState; names: Record<string, string> }) {
  const last = s.current.at(-1);
  if (!last) return <span className="text-muted">Nothing recorded yet.</span>;
  return (
    <span className="text-muted">
      {describeEntry(last.payload as RunStepPayload)} · {names[last.authorId] ?? last.authorId},{" "}
      {formatDate(last.recordedAt)}
    </span>
  );
}

function StepEntries({ s, ctx }: { s: StepState; ctx: Ctx }) {
  if (!s.history.length) return null;
  const sigs = ctx.view.state.signatures;
  return (
    <ul aria-label="Recorded for this step" className="flex flex-col gap-2">
      {s.history.map((e) => {
        const replaced = !s.current.includes(e);
        const p = e.payload as RunStepPayload;
        const local = e as StoredLocalEntry;
        return (
          <li key={e.id} className={`rounded-xl border border-line p-3 ${replaced ? "opacity-60" : ""}`}>
            <div className="flex flex-wrap items-center gap-2">
              <span
                className={`text-lg ${replaced ? "line-through" : "font-semibold"} ${p.kind === "reading" && p.outOfRange ? "text-warn" : ""}`}
              >
                {p.kind === "reading" && p.outOfRange ? "⚑ " : ""}
                {describeEntry(p)}
              </span>
              {p.kind === "check" && p.secondPersonId && (
                <span className="text-muted">with {ctx.names[p.secondPersonId] ?? p.secondPersonId}</span>
              )}
              <span className="text-sm text-muted">
                {ctx.names[e.authorId] ?? e.authorId} · {formatDate(e.recordedAt)}
              </span>
              {local.sync === "pending" && <Tag tone="accent">Saved on this tablet</Tag>}
              {local.sync === "rejected" && <Tag tone="danger">Refused</Tag>}
              {p.kind === "reading" && !replaced && ctx.view.state.status === "open" && (
                <CorrectReading entry={local} ctx={ctx} />
              )}
            </div>
            {e.supersedes && <p className="text-sm text-warn">Correction: {e.reason}</p>}
            {p.kind === "reading" && p.comment && <p className="text-muted">{p.comment}</p>}
            {p.kind === "photo" && <Photo id={p.attachmentId} />}
            {sigs
              .filter((g) => g.signedEntryId === e.id)
              .map((g) => (
                <div key={g.entryId} className="mt-2">
                  <SignatureManifestation sig={g} />
                </div>
              ))}
          </li>
        );
      })}
    </ul>
  );
}

async function writeStep(ctx: Ctx, payload: RunStepPayload, extra: { supersedes?: string; reason?: string } = {}) {
  ctx.onError(null);
  return recordEntry({
    cryostatId: ctx.cryostatId,
    runId: ctx.view.state.runId,
    kind: "run.step",
    payload: payload as never,
    ...extra,
  });
}

function StepAction({ s, ctx }: { s: StepState; ctx: Ctx }) {
  const step = s.step;
  switch (step.kind) {
    case "check":
      return <CheckAction step={step} s={s} ctx={ctx} />;
    case "reading":
      return <ReadingAction step={step} ctx={ctx} />;
    case "note":
      return <NoteAction step={step} ctx={ctx} />;
    case "photo":
      return <PhotoAction step={step} ctx={ctx} />;
    case "caution":
      return s.current.length ? null : <CautionAction step={step} ctx={ctx} />;
    case "hold":
      return s.status === "done" ? null : <HoldAction step={step} s={s} ctx={ctx} />;
  }
}

function CheckAction({ step, s, ctx }: { step: Extract<TemplateStep, { kind: "check" }>; s: StepState; ctx: Ctx }) {
  const users = useUsers();
  const [second, setSecond] = useState("");
  const [busy, setBusy] = useState(false);
  if (s.current.length && !step.secondPerson) return null;
  const others = (users ?? []).filter((u) => u.id !== ctx.me.id && u.active);
  return (
    <div className="flex flex-wrap items-end gap-3">
      {step.secondPerson && (
        <label className="flex min-w-64 flex-col gap-1 font-semibold">
          Second person present
          <select
            value={second}
            onChange={(e) => setSecond(e.target.value)}
            className="min-h-12 rounded-xl border-2 border-line bg-bg px-3 text-lg"
          >
            <option value="">Choose…</option>
            {others.map((u) => (
              <option key={u.id} value={u.id}>
                {u.name}
              </option>
            ))}
          </select>
        </label>
      )}
      <Button
        variant="primary"
        className="min-h-16 min-w-48 text-xl"
        disabled={busy || (step.secondPerson && !second)}
        onClick={async () => {
          setBusy(true);
          try {
            await writeStep(ctx, { stepId: step.id, kind: "check", ...(second ? { secondPersonId: second } : {}) });
          } catch (e) {
            ctx.onError(errorText(e));
          } finally {
            setBusy(false);
          }
        }}
      >
        ✓ Done
      </Button>
    </div>
  );
}

function ReadingAction({
  step,
  ctx,
  correcting,
  onDone,
}: {
  step: Extract<TemplateStep, { kind: "reading" }>;
  ctx: Ctx;
  correcting?: StoredLocalEntry;
  onDone?: () => void;
}) {
  const cryostat = useCryostat(ctx.cryostatId);
  const [value, setValue] = useState("");
  const [comment, setComment] = useState("");
  const [reason, setReason] = useState("");
  const [busy, setBusy] = useState(false);
  const n = keypadNumber(value);
  const out = n === null ? null : readingOutOfRange(step, n);
  const needsComment = out !== null && !comment.trim();
  const id = `${step.id}-${correcting ? "fix" : "value"}`;
  return (
    <div className="grid gap-4 md:grid-cols-[1fr_minmax(16rem,22rem)]">
      <div className="flex flex-col gap-3">
        <label htmlFor={id} className="font-semibold">
          {correcting ? "Corrected value" : "Value"} in {step.unit}{" "}
          <span className="font-normal text-muted">(acceptable: {describeRange(step)})</span>
        </label>
        <div className="flex items-center gap-2">
          <input
            id={id}
            inputMode="decimal"
            autoComplete="off"
            value={value}
            onChange={(e) => setValue(e.target.value.replace(",", ".").replace(/[^0-9.-]/g, ""))}
            aria-invalid={out !== null}
            aria-describedby={`${id}-check ${id}-derived`}
            className={`num w-full rounded-xl border-2 bg-bg px-4 py-3 text-4xl ${out ? "border-warn" : "border-line"}`}
          />
          <span className="num text-2xl font-semibold">{step.unit}</span>
        </div>
        <p
          id={`${id}-check`}
          role="status"
          className={`text-lg font-semibold ${out ? "text-warn" : n !== null ? "text-ok" : "text-muted"}`}
        >
          {n === null
            ? "Type the value."
            : out
              ? `Out of range: ${out === "low" ? "below" : "above"} ${describeRange(step)}.`
              : "Within range."}
        </p>
        {out && step.ifOutOfRange && (
          <Notice tone="warn" title="What to do">
            {step.ifOutOfRange}
          </Notice>
        )}
        {/* Derived figure from the maths engineer's component (e.g. still pressure → temperature). */}
        {cryostat && (
          <DerivedValue
            id={`${id}-derived`}
            cryostat={cryostat}
            quantity={step.quantity}
            unit={step.unit}
            value={value}
          />
        )}
        <label className="flex flex-col gap-1 font-semibold">
          Comment{out ? " (required: what was done)" : " (optional)"}
          <textarea
            value={comment}
            onChange={(e) => setComment(e.target.value)}
            rows={2}
            className="rounded-xl border-2 border-line bg-bg px-3 py-2 text-lg"
          />
        </label>
        {correcting && (
          <label className="flex flex-col gap-1 font-semibold">
            Reason for the correction (required)
            <input
              value={reason}
              onChange={(e) => setReason(e.target.value)}
              className="min-h-12 rounded-xl border-2 border-line bg-bg px-3 text-lg"
            />
          </label>
        )}
        <Button
          variant="primary"
          className="min-h-16 text-xl"
          disabled={busy || n === null || needsComment || (Boolean(correcting) && !reason.trim())}
          onClick={async () => {
            if (n === null) return;
            setBusy(true);
            try {
              await writeStep(
                ctx,
                {
                  stepId: step.id,
                  kind: "reading",
                  quantity: step.quantity,
                  value: n,
                  unit: step.unit,
                  outOfRange: out !== null,
                  ...(comment.trim() ? { comment: comment.trim() } : {}),
                },
                correcting ? { supersedes: correcting.id, reason: reason.trim() } : {},
              );
              setValue("");
              setComment("");
              setReason("");
              onDone?.();
            } catch (e) {
              ctx.onError(errorText(e));
            } finally {
              setBusy(false);
            }
          }}
        >
          {correcting ? "Record the correction" : out ? "Record flagged reading" : "Record reading"}
        </Button>
      </div>
      <Keypad value={value} onChange={setValue} label={`Keypad for ${step.quantity}`} />
    </div>
  );
}

function CorrectReading({ entry, ctx }: { entry: StoredLocalEntry; ctx: Ctx }) {
  const [open, setOpen] = useState(false);
  const step = ctx.view.template.steps.find((x) => x.id === (entry.payload as RunStepPayload).stepId);
  if (step?.kind !== "reading") return null;
  return (
    <>
      <Button onClick={() => setOpen((o) => !o)} className="ml-auto">
        {open ? "Cancel correction" : "Correct"}
      </Button>
      {open && (
        <div className="mt-3 w-full">
          <ReadingAction step={step} ctx={ctx} correcting={entry} onDone={() => setOpen(false)} />
        </div>
      )}
    </>
  );
}

function NoteAction({ step, ctx }: { step: Extract<TemplateStep, { kind: "note" }>; ctx: Ctx }) {
  const [text, setText] = useState("");
  const [busy, setBusy] = useState(false);
  return (
    <div className="flex flex-col gap-2">
      <label htmlFor={`${step.id}-note`} className="font-semibold">
        Note
      </label>
      <textarea
        id={`${step.id}-note`}
        value={text}
        onChange={(e) => setText(e.target.value)}
        rows={3}
        className="rounded-xl border-2 border-line bg-bg px-3 py-2 text-lg"
      />
      <Button
        variant="primary"
        className="min-h-14 self-start text-lg"
        disabled={busy || !text.trim()}
        onClick={async () => {
          setBusy(true);
          try {
            await writeStep(ctx, { stepId: step.id, kind: "note", text: text.trim() });
            setText("");
          } catch (e) {
            ctx.onError(errorText(e));
          } finally {
            setBusy(false);
          }
        }}
      >
        Save note
      </Button>
    </div>
  );
}

function PhotoAction({ step, ctx }: { step: Extract<TemplateStep, { kind: "photo" }>; ctx: Ctx }) {
  const [busy, setBusy] = useState(false);
  return (
    <label className={buttonClass("primary", `min-h-16 self-start text-xl ${busy ? "opacity-50" : ""} cursor-pointer`)}>
      📷 {busy ? "Saving photo…" : "Take a photo"}
      <input
        type="file"
        accept="image/*"
        capture="environment"
        className="sr-only"
        aria-label="Take a photo"
        disabled={busy}
        onChange={async (e) => {
          const file = e.target.files?.[0];
          e.target.value = "";
          if (!file) return;
          setBusy(true);
          try {
            const attachmentId = await putAttachment(file, {
              fileName: file.name || "photo.jpg",
              mime: file.type || "image/jpeg",
            });
            await writeStep(ctx, { stepId: step.id, kind: "photo", attachmentId });
          } catch (err) {
            ctx.onError(errorText(err));
          } finally {
            setBusy(false);
          }
        }}
      />
    </label>
  );
}

function CautionAction({ step, ctx }: { step: Extract<TemplateStep, { kind: "caution" }>; ctx: Ctx }) {
  const cryostat = useCryostat(ctx.cryostatId);
  const [busy, setBusy] = useState(false);
  return (
    <div className="flex flex-col gap-3">
      <Caution
        topic={cautionTopicFor(ctx.view.template.key, step.topic)}
        cryostatId={ctx.cryostatId}
        cryostatName={cryostat?.name ?? ctx.cryostatId}
      />
      <Button
        variant="primary"
        className="min-h-16 self-start text-xl"
        disabled={busy}
        onClick={async () => {
          setBusy(true);
          try {
            await writeStep(ctx, { stepId: step.id, kind: "caution", acknowledged: true });
          } catch (e) {
            ctx.onError(errorText(e));
          } finally {
            setBusy(false);
          }
        }}
      >
        I have read this caution
      </Button>
    </div>
  );
}

function HoldAction({ step, s, ctx }: { step: Extract<TemplateStep, { kind: "hold" }>; s: StepState; ctx: Ctx }) {
  const [signing, setSigning] = useState(false);
  if (ctx.me.role !== step.role) {
    return (
      <Notice tone="accent" title={`Needs a ${ROLE_LABEL[step.role as Role].toLowerCase()}'s signature`}>
        A {ROLE_LABEL[step.role as Role].toLowerCase()} signs this hold point on their own tablet, or here after signing
        in. The steps after it wait until then.
      </Notice>
    );
  }
  // A hold record written earlier whose signature did not go through is signed as it is.
  const unsigned = s.current.find((e) => !ctx.view.state.signatures.some((g) => g.valid && g.signedEntryId === e.id)) as
    | StoredLocalEntry
    | undefined;
  return (
    <>
      <Button variant="primary" className="min-h-16 self-start text-xl" onClick={() => setSigning(true)}>
        ✍ Sign hold point
      </Button>
      {signing && (
        <SignDialog
          me={ctx.me}
          meaning="verified"
          title="Sign the hold point"
          onClose={() => setSigning(false)}
          onSign={async (c) => {
            const target = unsigned ?? (await writeStep(ctx, { stepId: step.id, kind: "hold", statement: step.text }));
            await writeSignature(target, ctx.me, "verified", c);
          }}
        >
          <p>{step.text}</p>
        </SignDialog>
      )}
    </>
  );
}

function RunEnd({ ctx, state }: { ctx: Ctx; state: RunState }) {
  const [signing, setSigning] = useState(false);
  const [aborting, setAborting] = useState(false);
  const [reason, setReason] = useState("");
  const mayComplete = ctx.me.role === "technician" || ctx.me.role === "researcher";
  return (
    <Panel className="no-print flex flex-col gap-3">
      <div className="flex flex-wrap gap-2">
        <Button
          variant="primary"
          className="min-h-16 flex-1 text-xl"
          disabled={!state.canComplete || !mayComplete}
          onClick={() => setSigning(true)}
        >
          ✍ Complete and sign
        </Button>
        <Button variant="danger" className="min-h-16 text-xl" onClick={() => setAborting((a) => !a)}>
          Abort run…
        </Button>
      </div>
      {!state.canComplete && (
        <p className="text-muted">
          Complete becomes possible when every required step is done and every hold point is signed.
        </p>
      )}
      {aborting && (
        <div className="flex flex-col gap-2">
          <label htmlFor="abort-reason" className="font-semibold">
            Why is the run aborted? (required)
          </label>
          <textarea
            id="abort-reason"
            value={reason}
            onChange={(e) => setReason(e.target.value)}
            rows={2}
            className="rounded-xl border-2 border-line bg-bg px-3 py-2 text-lg"
          />
          <Button
            variant="danger"
            className="self-start"
            disabled={!reason.trim()}
            onClick={async () => {
              try {
                await recordEntry({
                  cryostatId: ctx.cryostatId,
                  runId: state.runId,
                  kind: "run.abort",
                  payload: { reason: reason.trim() },
                });
                setAborting(false);
              } catch (e) {
                ctx.onError(errorText(e));
              }
            }}
          >
            Abort the run
          </Button>
        </div>
      )}
      {signing && (
        <SignDialog
          me={ctx.me}
          meaning="performed"
          title="Complete the procedure"
          onClose={() => setSigning(false)}
          onSign={async (c) => {
            const done = await recordEntry({
              cryostatId: ctx.cryostatId,
              runId: state.runId,
              kind: "run.complete",
              payload: {},
            });
            await writeSignature(done, ctx.me, "performed", c);
          }}
        >
          <p>
            I performed this procedure as recorded: {state.progress.done} of {state.progress.required} required steps
            done.
          </p>
        </SignDialog>
      )}
    </Panel>
  );
}

/** A completion whose signature did not go through (e.g. a wrong password) is signed as it stands. */
function SignCompletion({ ctx, entry }: { ctx: Ctx; entry: StoredLocalEntry }) {
  const [signing, setSigning] = useState(false);
  if (ctx.me.id !== entry.authorId) return null;
  return (
    <Panel className="no-print">
      <Button variant="primary" className="min-h-16 text-xl" onClick={() => setSigning(true)}>
        ✍ Sign the completion
      </Button>
      {signing && (
        <SignDialog
          me={ctx.me}
          meaning="performed"
          title="Sign the completion"
          onClose={() => setSigning(false)}
          onSign={async (c) => void (await writeSignature(entry, ctx.me, "performed", c))}
        >
          <p>I performed this procedure as recorded.</p>
        </SignDialog>
      )}
    </Panel>
  );
}
