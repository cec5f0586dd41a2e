// The checks an entry must pass against the stored log, and the projections updated in the same
// transaction as the entries they derive from.
// Feature modules supply their own checks (runChecks, auditChecks: each names the entries it
// looks at) and projectors.
import type { Db } from "@/db/client";
import { signatures } from "@/db/schema";
import { type EntryInput, isKind, type StoredEntry } from "@/lib/schemas/entry";
import type { SessionUser } from "@/lib/schemas/user";
import { auditChecks } from "./audit";
import type { LogCheck, Problem, Projector } from "./log-check";
import { mailProjector } from "./mail";
import { peopleChecks } from "./people-check";
import { recordChecks } from "./record-checks";
import { runTransferChecks } from "./run-transfer";
import { projectRuns, runChecks } from "./runs";

export type { Problem };

const checks: LogCheck[] = [
  // The record rules first (lib/record/rules.ts): who may correct, sign and complete what.
  ...recordChecks,
  ...runChecks,
  ...auditChecks,
  ...peopleChecks,
  ...runTransferChecks,
];
const projectors: Projector[] = [
  async (db, rows) => {
    for (const r of rows.filter((x) => isKind(x, "signature"))) {
      const p = r.payload;
      await db
        .insert(signatures)
        .values({
          entryId: r.id,
          signedEntryId: p.signedEntryId,
          signerId: r.authorId,
          meaning: p.meaning,
          signedHash: p.signedHash,
          signedAt: r.recordedAt,
        })
        .onConflictDoNothing();
    }
  },
  projectRuns,
  // Queues each quench / needs-action finding e-mail once, in the same transaction (delivery is separate).
  mailProjector,
];

/** True when some check looks at this entry (else it needs no look at the log). */
export function checkedAgainstLog(e: EntryInput): boolean {
  return checks.some((c) => c.when(e));
}

export async function validateAgainstLog(
  db: Db,
  e: EntryInput,
  batch: Map<string, EntryInput>,
  user: SessionUser,
  ahead: readonly EntryInput[] = [],
): Promise<Problem | null> {
  for (const { when, check } of checks) {
    if (!when(e)) continue;
    const problem = await check(db, e, batch, user, ahead);
    if (problem) return problem;
  }
  return null;
}

export async function runProjectors(db: Db, rows: StoredEntry[]): Promise<void> {
  for (const p of projectors) await p(db, rows);
}
