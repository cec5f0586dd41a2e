// A procedure run's state, derived from the log alone (no stored progress to drift): which steps
// are done, readings against the pinned template's range, hold points and who released them,
// corrections, abort and completion. Pure: the tablet runs it on Dexie rows, the server on
// PGlite rows, and two tablets writing to one run converge on the same answer.
import { type EntryFields, isKind, payloadOf, type SignatureMeaning } from "@/lib/schemas/entry";
import type { RunStartPayload } from "@/lib/schemas/run";
import type { TemplateStep } from "@/lib/schemas/template";
import { recordHash } from "@/lib/sync/hash";

/** What the derivation needs of an entry (stored or still in the tablet's outbox). */
export type RunEntry = EntryFields<
  "id" | "cryostatId" | "runId" | "authorId" | "deviceId" | "recordedAt" | "supersedes" | "reason"
>;

/** A step entry of a run (its payload the step's kind and figures), of the caller's entry type. */
export type StepEntry<E extends RunEntry = RunEntry> = Extract<E, { kind: "run.step" }>;

export type PinnedTemplate = { id: string; key: string; version: number; title: string; steps: TemplateStep[] };

export type SignatureView = {
  entryId: string;
  signedEntryId: string;
  meaning: SignatureMeaning;
  signerId: string;
  signerName: string;
  signerRole: string;
  signedAt: string;
  confirmedBy: "pin" | "password" | null;
  image: string | null;
  /** The signature's hash still matches the record it names (false: the record was altered). */
  valid: boolean;
};

export type StepStatus = "todo" | "done" | "flagged" | "awaiting_signature" | "blocked";

/** A step and its entries, of the entry type the run was derived from (tablet or server rows). */
export type StepState<E extends RunEntry = RunEntry> = {
  step: TemplateStep;
  index: number;
  status: StepStatus;
  required: boolean;
  /** Entries for this step still in force, oldest first. */
  current: StepEntry<E>[];
  /** Every entry ever written for this step, superseded ones included, oldest first. */
  history: StepEntry<E>[];
  problems: string[];
  /** Hold points: when the required role signed, if it has. */
  releasedAt: string | null;
};

export type Correction<E extends RunEntry = RunEntry> = { original: E; correction: E; inForce: boolean };

export type RunState<E extends RunEntry = RunEntry> = {
  runId: string;
  start: E | null;
  startPayload: RunStartPayload | null;
  status: "open" | "completed" | "aborted";
  steps: StepState<E>[];
  progress: { done: number; required: number; percent: number };
  /** The first step still to do (the one a technician works on next), or null when all are done. */
  currentIndex: number | null;
  /** The first hold point not yet released: steps after it wait for it. */
  blockingHold: number | null;
  canComplete: boolean;
  aborted: { entry: E; reason: string } | null;
  completed: { entry: E } | null;
  signatures: SignatureView[];
  corrections: Correction<E>[];
  flags: string[];
  /** Every entry of the run in order, for the printed record. */
  timeline: E[];
};

const byTime = (a: RunEntry, b: RunEntry) =>
  a.recordedAt < b.recordedAt ? -1 : a.recordedAt > b.recordedAt ? 1 : a.id < b.id ? -1 : a.id > b.id ? 1 : 0;

/** A reading against its step's limits. Limits are inclusive: a value on the limit is in range. */
export function readingOutOfRange(
  step: Pick<Extract<TemplateStep, { kind: "reading" }>, "min" | "max">,
  value: number,
): "low" | "high" | null {
  if (!Number.isFinite(value)) return null;
  if (step.min !== undefined && value < step.min) return "low";
  if (step.max !== undefined && value > step.max) return "high";
  return null;
}

export function describeRange(step: Pick<Extract<TemplateStep, { kind: "reading" }>, "min" | "max" | "unit">): string {
  const { min, max, unit } = step;
  if (min !== undefined && max !== undefined) return `${min} – ${max} ${unit}`;
  if (min !== undefined) return `at least ${min} ${unit}`;
  if (max !== undefined) return `at most ${max} ${unit}`;
  return "no limit set";
}

/** Signatures found among the entries, each checked against the exact record it names. */
export function signaturesOf(entries: RunEntry[]): SignatureView[] {
  const byId = new Map(entries.map((e) => [e.id, e]));
  return entries
    .filter((e) => isKind(e, "signature"))
    .map((e) => {
      const p = e.payload;
      const target = byId.get(p.signedEntryId);
      return {
        entryId: e.id,
        signedEntryId: p.signedEntryId,
        meaning: p.meaning,
        signerId: e.authorId,
        signerName: p.signerName,
        signerRole: p.signerRole,
        signedAt: e.recordedAt,
        confirmedBy: p.confirmedBy ?? null,
        image: p.image ?? null,
        valid: Boolean(target && recordHash(target) === p.signedHash),
      };
    })
    .sort((a, b) => (a.signedAt < b.signedAt ? -1 : 1));
}

/**
 * Which entries are replaced by a correction. A correction of a signed record only takes effect
 * once the correction carries a valid signature of its own; until then the signed original stays
 * in force and the correction is shown as waiting for its signature.
 */
export function correctionsOf<E extends RunEntry>(entries: E[], signatures: SignatureView[]): Correction<E>[] {
  const signed = new Set(signatures.filter((s) => s.valid).map((s) => s.signedEntryId));
  const byId = new Map(entries.map((e) => [e.id, e]));
  const out: Correction<E>[] = [];
  for (const c of entries) {
    if (!c.supersedes) continue;
    const original = byId.get(c.supersedes);
    if (!original) continue;
    out.push({ original, correction: c, inForce: !signed.has(original.id) || signed.has(c.id) });
  }
  return out;
}

/**
 * Derive a run's state from its entries (run.*, and signatures on them) and its pinned template.
 * The entries come back in the state as the type they were passed in (tablet or server rows).
 */
export function deriveRun<E extends RunEntry>(runId: string, template: PinnedTemplate, rawEntries: E[]): RunState<E> {
  const entries = [...rawEntries].filter((e) => e.runId === runId || e.id === runId).sort(byTime);
  const signatures = signaturesOf(entries);
  const corrections = correctionsOf(entries, signatures);
  const replaced = new Set(corrections.filter((c) => c.inForce).map((c) => c.original.id));
  // A correction still waiting for its signature is not in force either.
  const pending = new Set(corrections.filter((c) => !c.inForce).map((c) => c.correction.id));
  const inForce = entries.filter((e) => !replaced.has(e.id) && !pending.has(e.id));
  const validSigs = signatures.filter((s) => s.valid);
  const sigsOn = (id: string) => validSigs.filter((s) => s.signedEntryId === id);

  const start = entries.find((e) => e.kind === "run.start" && e.id === runId) ?? null;
  const abortEntry = inForce.find((e) => isKind(e, "run.abort")) ?? null;
  const completeEntry = inForce.find((e) => e.kind === "run.complete") ?? null;
  const flags: string[] = [];

  // Hold points first: what each one releases and when.
  const steps: StepState<E>[] = template.steps.map((step, index) => {
    const history = entries.filter((e) => isKind(e, "run.step")).filter((e) => e.payload.stepId === step.id);
    const current = history.filter((e) => !replaced.has(e.id) && !pending.has(e.id));
    const problems: string[] = [];
    let status: StepStatus = current.length ? "done" : "todo";
    let releasedAt: string | null = null;
    switch (step.kind) {
      case "check":
        if (
          step.secondPerson &&
          current.length &&
          !current.some((e) => e.payload.kind === "check" && e.payload.secondPersonId)
        ) {
          problems.push("Needs a second person, and none was named.");
          status = "flagged";
        }
        break;
      case "reading": {
        const last = current.at(-1);
        const p = last?.payload;
        if (p?.kind === "reading") {
          const out = readingOutOfRange(step, p.value);
          if (out) {
            status = "flagged";
            problems.push(`Out of range (${out === "low" ? "below" : "above"} ${describeRange(step)}).`);
            if (!p.comment?.trim()) problems.push("Out-of-range reading without a comment.");
          }
        }
        break;
      }
      case "hold": {
        const releases = current
          .flatMap((e) => sigsOn(e.id))
          .filter((s) => s.signerRole === step.role)
          .sort((a, b) => (a.signedAt < b.signedAt ? -1 : 1));
        releasedAt = releases[0]?.signedAt ?? null;
        status = releasedAt ? "done" : current.length ? "awaiting_signature" : "todo";
        break;
      }
      default:
        break;
    }
    return { step, index, status, required: step.kind !== "note", current, history, problems, releasedAt };
  });

  // Steps after an unreleased hold point wait for it; anything written there before the release
  // (another tablet, or a tablet that had not yet seen the signature) is kept and flagged.
  let blockingHold: number | null = null;
  for (const s of steps) {
    if (s.step.kind !== "hold") continue;
    for (const later of steps.slice(s.index + 1)) {
      const early = later.current.filter((e) => !s.releasedAt || e.recordedAt < s.releasedAt);
      if (early.length) later.problems.push(`Recorded before the hold point "${shorten(s.step.text)}" was signed.`);
    }
    if (!s.releasedAt && blockingHold === null) blockingHold = s.index;
  }
  if (blockingHold !== null)
    for (const s of steps.slice(blockingHold + 1)) if (s.status === "todo") s.status = "blocked";
  for (const s of steps) if (s.problems.length && s.status === "done") s.status = "flagged";

  const required = steps.filter((s) => s.required);
  const done = required.filter((s) => s.status === "done" || s.status === "flagged").length;
  const currentStep = steps.find(
    (s) => s.status === "todo" || s.status === "awaiting_signature" || s.status === "blocked",
  );
  const status = abortEntry ? "aborted" : completeEntry ? "completed" : "open";
  const allDone = done === required.length && blockingHold === null;
  if (status === "completed" && !allDone)
    flags.push(`Marked complete with ${required.length - done} required step(s) open.`);
  if (completeEntry && !sigsOn(completeEntry.id).some((s) => s.meaning === "performed"))
    flags.push("Completion not yet signed.");
  for (const sig of signatures)
    if (!sig.valid) flags.push(`A signature by ${sig.signerName} does not match the record it names.`);
  for (const c of corrections)
    if (!c.inForce)
      flags.push(`A correction of a signed record waits for its own signature: ${c.correction.reason ?? ""}`.trim());
  if (!start) flags.push("The start of this run is not on this device yet.");

  return {
    runId,
    start,
    startPayload: payloadOf(start, "run.start") ?? null,
    status,
    steps,
    progress: {
      done,
      required: required.length,
      percent: required.length ? Math.round((100 * done) / required.length) : 100,
    },
    currentIndex: currentStep ? currentStep.index : null,
    blockingHold,
    canComplete: status === "open" && allDone,
    aborted: abortEntry ? { entry: abortEntry, reason: abortEntry.payload.reason } : null,
    completed: completeEntry ? { entry: completeEntry } : null,
    signatures,
    corrections,
    flags,
    timeline: entries,
  };
}

function shorten(text: string, n = 60): string {
  return text.length > n ? `${text.slice(0, n - 1)}…` : text;
}
