// Checks an entry must pass against the stored log (signature binding, corrections), and the
// projections updated in the same transaction as the entries they derive from.
// Feature modules supply their own checks (runChecks, auditChecks: each names the entries it
// looks at) and projectors.
import { eq } from "drizzle-orm";
import type { Db } from "@/db/client";
import { entries, signatures } from "@/db/schema";
import { type EntryInput, isKind, type StoredEntry } from "@/lib/schemas/entry";
import type { SessionUser } from "@/lib/schemas/user";
import { recordHash } from "@/lib/sync/hash";
import { auditChecks } from "./audit";
import { type Check, forKinds, type LogCheck, type Problem, type Projector } from "./log-check";
import { mailProjector } from "./mail";
import { peopleChecks } from "./people-check";
import { runTransferChecks } from "./run-transfer";
import { projectRuns, runChecks } from "./runs";
import { toStoredRow } from "./stored";

export type { Problem };

async function findEntry(db: Db, id: string, batch: Map<string, EntryInput>): Promise<EntryInput | undefined> {
  const inBatch = batch.get(id);
  if (inBatch) return inBatch;
  const [row] = await db.select().from(entries).where(eq(entries.id, id));
  return row ? toStoredRow(row) : undefined;
}

/** A signature must name a stored record and carry the hash of exactly that record's content. */
const signatureBinding: Check<EntryInput<"signature">> = async (db, e, batch, user) => {
  const p = e.payload;
  if (p.signerRole !== user.role)
    return { code: "forbidden:signature", message: "The signer's role does not match the signed-in user's role." };
  const target = await findEntry(db, p.signedEntryId, batch);
  if (!target)
    return {
      code: "bad_request:signature",
      message: "The signed record is not on the server; send it first (or together).",
    };
  if (recordHash(target) !== p.signedHash) {
    return {
      code: "conflict:signature",
      message: "The signature does not match the record's content: the record was changed after signing.",
    };
  }
  return null;
};

/** A correction must name a stored record of the same cryostat. */
const correctionTarget: Check = async (db, e, batch) => {
  const target = await findEntry(db, e.supersedes!, batch);
  if (!target) return { code: "bad_request:supersedes", message: "The corrected entry is not on the server." };
  if (target.cryostatId !== e.cryostatId)
    return {
      code: "bad_request:supersedes",
      message: "A correction must belong to the same cryostat as the entry it corrects.",
    };
  return null;
};

const checks: LogCheck[] = [
  forKinds(["signature"], signatureBinding),
  { when: (e) => e.supersedes !== null, check: correctionTarget },
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
): Promise<Problem | null> {
  for (const { when, check } of checks) {
    if (!when(e)) continue;
    const problem = await check(db, e, batch, user);
    if (problem) return problem;
  }
  return null;
}

export async function runProjectors(db: Db, rows: StoredEntry[]): Promise<void> {
  for (const p of projectors) await p(db, rows);
}
