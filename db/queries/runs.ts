// Procedure runs on the server: the `runs` projection (kept in the same transaction as the
// entries, via db/queries/projections.ts), the checks a run entry and a signature must pass
// against the log, and reading a run with its entries for the run record.
import { and, desc, eq, inArray, or } from "drizzle-orm";
import type { Db } from "@/db/client";
import { cryostats, entries, procedureTemplates, type Run, runs, users } from "@/db/schema";
import { readingOutOfRange } from "@/lib/procedures/state";
import { type EntryInput, isKind, payloadOf, type StoredEntry } from "@/lib/schemas/entry";
import type { TemplateStep } from "@/lib/schemas/template";
import { type Check, findEntry, forKinds, type LogCheck, type Problem, type Projector } from "./log-check";
import { proofChecksOut, recordRejectedPinProof } from "./pin-proofs";
import { toStoredRow } from "./stored";

const bad = (message: string): Problem => ({ code: "bad_request:run", message });

/** run.start pins an existing template version that fits the cryostat; its id is the run's id. */
const runStartCheck: Check<EntryInput<"run.start">> = async (db, e) => {
  const p = e.payload;
  // The start entry's own id is the run's id (the tablet store assigns ids on write, so runId may be left empty).
  if (e.runId !== null && e.runId !== e.id) return bad("A run's start entry carries no runId, or its own id.");
  if (!e.cryostatId) return bad("A run belongs to a cryostat.");
  const [t] = await db.select().from(procedureTemplates).where(eq(procedureTemplates.id, p.templateId));
  if (!t || t.key !== p.templateKey || t.version !== p.templateVersion)
    return bad("The procedure template version named by this run is not on the server.");
  const [c] = await db.select({ kind: cryostats.kind }).from(cryostats).where(eq(cryostats.id, e.cryostatId));
  if (c && !t.cryostatKinds.includes(c.kind)) return bad(`"${t.title}" is not written for this kind of cryostat.`);
  return null;
};

/** Step, abort and completion entries must name a started run of the same cryostat and a real step. */
const runEntryCheck: Check<EntryInput<"run.step" | "run.abort" | "run.complete">> = async (db, e, batch) => {
  if (!e.runId) return bad("A procedure entry must name its run.");
  const start = await findEntry(db, e.runId, batch);
  if (!start || !isKind(start, "run.start"))
    return bad("The run this entry belongs to has not reached the server; send its start first.");
  if (start.cryostatId !== e.cryostatId) return bad("A procedure entry must belong to the run's cryostat.");
  if (e.kind !== "run.step") return null;
  const sp = start.payload;
  const [t] = await db
    .select({ steps: procedureTemplates.steps })
    .from(procedureTemplates)
    .where(eq(procedureTemplates.id, sp.templateId));
  const p = e.payload;
  const step = t?.steps.find((s: TemplateStep) => s.id === p.stepId);
  if (!step) return bad(`Step "${p.stepId}" is not in version ${sp.templateVersion} of this procedure.`);
  if (step.kind !== p.kind) return bad(`Step "${p.stepId}" is a ${step.kind} step, not ${p.kind}.`);
  if (step.kind === "reading" && p.kind === "reading") {
    if (p.unit !== step.unit) return bad(`This reading is taken in ${step.unit}.`);
    const out = readingOutOfRange(step, p.value) !== null;
    // Re-checked here so that the flag on a record can be trusted without the template at hand.
    if (out !== p.outOfRange)
      return bad(
        out
          ? "This reading is outside the step's range but is not flagged."
          : "This reading is flagged out of range but is within the step's range.",
      );
    if (out && !p.comment?.trim()) return bad("An out-of-range reading needs a comment saying what was done.");
  }
  if (e.supersedes) {
    const original = await findEntry(db, e.supersedes, batch);
    if (original && payloadOf(original, "run.step")?.stepId !== p.stepId)
      return bad("A correction of a step must replace an entry of the same step.");
  }
  return null;
};

/**
 * Every signature that says how the signer confirmed their identity is re-verified; signatures on
 * procedure records must say it (a signature needs the signer's PIN or password). Older records
 * signed before PINs existed stay readable and are shown as "identity not confirmed".
 */
const signatureConfirmation: Check<EntryInput<"signature">> = async (db, e) => {
  const p = e.payload;
  // A signature without a proof is refused by the record rules (record-checks.ts) before this check.
  if (!p.confirmedBy || !p.confirmProof) return null;
  const ok = await proofChecksOut(db, e.authorId, p);
  // A refused PIN proof is counted (a guessing tablet shows up in the count); the batch still commits.
  if (!ok && p.confirmedBy === "pin")
    await recordRejectedPinProof(db, { userId: e.authorId, entryId: e.id, now: new Date() });
  return ok
    ? null
    : {
        code: "forbidden:signature",
        message: `The ${p.confirmedBy === "pin" ? "PIN" : "password"} confirmation of this signature does not check out (changed since, or not the signer's).`,
      };
};

export const runChecks: LogCheck[] = [
  forKinds(["run.start"], runStartCheck),
  forKinds(["run.step", "run.abort", "run.complete"], runEntryCheck),
  forKinds(["signature"], signatureConfirmation),
];

/** The `runs` projection: one row per run, its end written by the first abort or completion. */
export const projectRuns: Projector = async (db, rows) => {
  for (const r of rows) {
    if (r.kind === "run.start" && r.cryostatId) {
      const p = r.payload;
      await db
        .insert(runs)
        .values({
          id: r.id,
          cryostatId: r.cryostatId,
          templateId: p.templateId,
          title: p.title,
          status: "open",
          startedBy: r.authorId,
          startedAt: r.recordedAt,
        })
        .onConflictDoNothing();
    } else if ((r.kind === "run.abort" || r.kind === "run.complete") && r.runId) {
      await db
        .update(runs)
        .set({ status: r.kind === "run.abort" ? "aborted" : "completed", endedAt: r.recordedAt })
        .where(and(eq(runs.id, r.runId), eq(runs.status, "open")));
    }
  }
};

export type RunListItem = Run & { templateKey: string; templateVersion: number; startedByName: string };

export async function listRuns(
  db: Db,
  { cryostatId, status }: { cryostatId?: string; status?: Run["status"] } = {},
): Promise<RunListItem[]> {
  const rows = await db
    .select({ run: runs, key: procedureTemplates.key, version: procedureTemplates.version, name: users.name })
    .from(runs)
    .innerJoin(procedureTemplates, eq(procedureTemplates.id, runs.templateId))
    .leftJoin(users, eq(users.id, runs.startedBy))
    .where(and(cryostatId ? eq(runs.cryostatId, cryostatId) : undefined, status ? eq(runs.status, status) : undefined))
    .orderBy(desc(runs.startedAt))
    .limit(200);
  return rows.map((r) => ({
    ...r.run,
    templateKey: r.key,
    templateVersion: r.version,
    startedByName: r.name ?? r.run.startedBy,
  }));
}

/** A run with every entry that belongs to it (steps, signatures, corrections) and its pinned template. */
export async function getRunRecord(db: Db, { runId }: { runId: string }) {
  const [run] = await db.select().from(runs).where(eq(runs.id, runId));
  if (!run) return null;
  const [template] = await db.select().from(procedureTemplates).where(eq(procedureTemplates.id, run.templateId));
  const rows = await db
    .select()
    .from(entries)
    .where(or(eq(entries.runId, runId), eq(entries.id, runId)))
    .orderBy(entries.seq);
  const list: StoredEntry[] = rows.map(toStoredRow);
  const ids = [...new Set(list.map((e) => e.authorId))];
  const names = ids.length
    ? await db.select({ id: users.id, name: users.name }).from(users).where(inArray(users.id, ids))
    : [];
  return { run, template: template!, entries: list, names: Object.fromEntries(names.map((n) => [n.id, n.name])) };
}

/** Signing secrets of one user (server only): the stored PIN record and password hash. */
export async function signingSecrets(db: Db, { userId }: { userId: string }) {
  const [u] = await db
    .select({ email: users.email, pinHash: users.pinHash, passwordHash: users.passwordHash, active: users.active })
    .from(users)
    .where(eq(users.id, userId));
  return u;
}

export async function setPinRecord(db: Db, { userId, record }: { userId: string; record: string }): Promise<void> {
  await db.update(users).set({ pinHash: record }).where(eq(users.id, userId));
}
