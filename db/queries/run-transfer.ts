// The transfer record a procedure run makes (lib/procedures/transfer-record.ts), held by the
// server: a `transfer` entry that names a run must carry exactly the figures the run's stored
// steps give, one per run; a run whose template makes a transfer record completes only with that
// record (sent first, or already stored). And the run's flags beside its transfer in the audit.
import { eq, inArray, or } from "drizzle-orm";
import type { Db } from "@/db/client";
import { cryostats, entries, procedureTemplates } from "@/db/schema";
import type { LevelCalibration } from "@/lib/cryo";
import { deriveRun, type RunState } from "@/lib/procedures/state";
import { makesTransferRecord, runFlagsForAudit, transferFromRun } from "@/lib/procedures/transfer-record";
import { type EntryInput, isKind } from "@/lib/schemas/entry";
import { canonicalJson } from "@/lib/sync/hash";
import { type Check, forKinds, type LogCheck, type Problem } from "./log-check";
import { toStoredRow } from "./stored";

type LoadedRun = {
  state: RunState<EntryInput>;
  title: string;
  makesRecord: boolean;
  calibration: LevelCalibration | undefined;
  /** The run's transfer entries (stored and earlier in the batch). */
  transfers: EntryInput<"transfer">[];
};

/** A run as the log (and the batch so far) holds it, derived with its pinned template. */
async function loadRun(db: Db, runId: string, batch: Map<string, EntryInput>): Promise<LoadedRun | null> {
  const rows = (
    await db
      .select()
      .from(entries)
      .where(or(eq(entries.runId, runId), eq(entries.id, runId)))
  ).map(toStoredRow) as EntryInput[];
  const ids = new Set(rows.map((r) => r.id));
  for (const e of batch.values()) if ((e.runId === runId || e.id === runId) && !ids.has(e.id)) rows.push(e);
  const start = rows.find((r) => r.id === runId);
  if (!start || !isKind(start, "run.start")) return null;
  const [t] = await db.select().from(procedureTemplates).where(eq(procedureTemplates.id, start.payload.templateId));
  if (!t) return null;
  const [c] = start.cryostatId
    ? await db.select({ config: cryostats.config }).from(cryostats).where(eq(cryostats.id, start.cryostatId))
    : [];
  const state = deriveRun(runId, t, rows);
  return {
    state,
    title: start.payload.title,
    makesRecord: makesTransferRecord(t.steps),
    calibration: c?.config.reservoir?.calibration,
    transfers: rows.filter((r): r is EntryInput<"transfer"> => isKind(r, "transfer")),
  };
}

const bad = (message: string): Problem => ({ code: "bad_request:transfer", message });

/** The transfers of a run still in force (not replaced by a later correction among them). */
function inForce(transfers: EntryInput<"transfer">[]): EntryInput<"transfer">[] {
  const replaced = new Set(transfers.map((t) => t.supersedes).filter(Boolean));
  return transfers.filter((t) => !replaced.has(t.id));
}

/** The fields of `sent` that differ from `built`, by name. */
function differingFields(built: Record<string, unknown>, sent: Record<string, unknown>): string[] {
  const keys = [...new Set([...Object.keys(built), ...Object.keys(sent)])].sort();
  return keys.filter((k) => canonicalJson(built[k] ?? null) !== canonicalJson(sent[k] ?? null));
}

/** The figures the run's steps give, against the record's: the names of the differing fields. */
function mismatch(run: LoadedRun, payload: EntryInput<"transfer">["payload"]): Problem | null {
  const built = transferFromRun(run.state, { calibration: run.calibration });
  if (!built.ok)
    return bad(
      `The run's steps do not make a transfer record yet: ${built.problems.join(" ")} Finish the steps first.`,
    );
  const diff = differingFields(built.payload, payload);
  return diff.length
    ? {
        code: "conflict:transfer",
        message: `This transfer record does not match the run's steps (${diff.join(", ")}): the record is built from the steps; correct a step, not the record.`,
      }
    : null;
}

/** A transfer that names a run: a run of a template that makes one, not aborted, one per run, figures from its steps. */
const runTransferCheck: Check<EntryInput<"transfer">> = async (db, e, batch) => {
  if (!e.runId) return null;
  const run = await loadRun(db, e.runId, batch);
  if (!run) return bad("The run this transfer names has not reached the server; send its start first.");
  if (run.state.start?.cryostatId !== e.cryostatId)
    return bad("A run's transfer record belongs to the run's cryostat.");
  if (!run.makesRecord) return bad(`"${run.title}" does not make a transfer record; record the transfer on its own.`);
  if (run.state.status === "aborted") return bad("This run was aborted; an aborted run makes no transfer record.");
  const others = inForce(run.transfers).filter((t) => t.id !== e.supersedes);
  if (others.length)
    return {
      code: "conflict:transfer",
      message: "This run already has its transfer record; a run makes one (correct that one instead).",
    };
  return mismatch(run, e.payload);
};

/** A run whose template makes a transfer record completes only with that record, still matching its steps. */
const completionNeedsTransfer: Check<EntryInput<"run.complete">> = async (db, e, batch) => {
  if (!e.runId) return null; // refused by the run checks (db/queries/runs.ts)
  const run = await loadRun(db, e.runId, batch);
  if (!run?.makesRecord) return null;
  const [record] = inForce(run.transfers);
  if (!record)
    return bad(
      `"${run.title}" makes a transfer record: send the run's transfer entry with its completion (before it, in the same push).`,
    );
  const problem = mismatch(run, record.payload);
  return problem
    ? {
        ...problem,
        message: "The run's steps changed after its transfer record was written: correct the transfer record first.",
      }
    : null;
};

export const runTransferChecks: LogCheck[] = [
  forKinds(["transfer"], runTransferCheck),
  forKinds(["run.complete"], completionNeedsTransfer),
];

/** For the audit: each transfer made by a run, the run's title and its flags, keyed by the transfer's id. */
export async function runFlagsByTransfer(
  db: Db,
  transfers: { id: string; runId: string | null }[],
): Promise<Map<string, { title: string; flags: string[] }>> {
  const out = new Map<string, { title: string; flags: string[] }>();
  const runIds = [...new Set(transfers.flatMap((t) => (t.runId ? [t.runId] : [])))];
  if (!runIds.length) return out;
  const starts = await db.select({ id: entries.id }).from(entries).where(inArray(entries.id, runIds));
  const byRun = new Map<string, { title: string; flags: string[] }>();
  for (const { id } of starts) {
    const run = await loadRun(db, id, new Map());
    if (run) byRun.set(id, { title: run.title, flags: runFlagsForAudit(run.state) });
  }
  for (const t of transfers) {
    const r = t.runId ? byRun.get(t.runId) : undefined;
    if (r) out.set(t.id, r);
  }
  return out;
}
