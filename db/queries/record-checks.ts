// The server's side of the record rules (lib/record/rules.ts): each check looks up the facts a
// rule needs — the corrected record, the signed record, the run so far, the signatures sent with
// an entry — and lets the pure rule decide. The tablet runs the same rules on its own copy.
import { and, desc, eq, or } from "drizzle-orm";
import type { Db } from "@/db/client";
import { cryostats, entries, facilityRules, procedureTemplates, signatures, users } from "@/db/schema";
import { deriveRun, type PinnedTemplate, type RunEntry } from "@/lib/procedures/state";
import { magnetLimitRefusal } from "@/lib/record/magnet";
import { completionRefusal, correctionRefusal, signatureRefusal } from "@/lib/record/rules";
import { type EntryInput, isKind, type SignatureMeaning } from "@/lib/schemas/entry";
import type { SessionUser } from "@/lib/schemas/user";
import { recordHash } from "@/lib/sync/hash";
import { type Check, findEntry, forKinds, type LogCheck } from "./log-check";
import { proofChecksOut } from "./pin-proofs";
import { toStoredRow } from "./stored";

/** The signer's name and role as the facility's user record holds them (never the payload's). */
async function actorOf(db: Db, user: SessionUser) {
  const [u] = await db.select({ name: users.name, role: users.role }).from(users).where(eq(users.id, user.id));
  return { id: user.id, name: u?.name ?? user.name, role: u?.role ?? user.role };
}

/**
 * Does `ahead` (the rest of the batch) hold a signature by `signerId` on exactly `target`, with
 * one of the meanings given and a proof that checks out? Used where a rule needs an entry to be
 * signed by its writer as it is sent (a correction of another's record, a run's completion).
 */
async function signedWith(
  db: Db,
  target: EntryInput,
  signerId: string,
  meanings: readonly SignatureMeaning[],
  ahead: readonly EntryInput[],
): Promise<boolean> {
  const hash = recordHash(target);
  const sig = ahead.find(
    (s) =>
      isKind(s, "signature") &&
      s.authorId === signerId &&
      s.payload.signedEntryId === target.id &&
      s.payload.signedHash === hash &&
      meanings.includes(s.payload.meaning),
  );
  return Boolean(sig && isKind(sig, "signature") && (await proofChecksOut(db, signerId, sig.payload)));
}

const signatureCheck: Check<EntryInput<"signature">> = async (db, e, batch, user) => {
  const p = e.payload;
  const target = await findEntry(db, p.signedEntryId, batch);
  const inBatch = [...batch.values()].some(
    (s) =>
      isKind(s, "signature") &&
      s.authorId === e.authorId &&
      s.payload.signedEntryId === p.signedEntryId &&
      s.payload.meaning === p.meaning,
  );
  const [stored] = inBatch
    ? [true]
    : await db
        .select({ id: signatures.entryId })
        .from(signatures)
        .where(
          and(
            eq(signatures.signedEntryId, p.signedEntryId),
            eq(signatures.signerId, e.authorId),
            eq(signatures.meaning, p.meaning),
          ),
        )
        .limit(1);
  return signatureRefusal({ signature: e, target, alreadySigned: Boolean(stored) }, await actorOf(db, user));
};

const correctionCheck: Check = async (db, e, batch, user, ahead) => {
  const original = await findEntry(db, e.supersedes!, batch);
  const needsSignature = original !== undefined && original.authorId !== user.id;
  const signedByCorrector = needsSignature ? await signedWith(db, e, user.id, ["verified", "performed"], ahead) : false;
  return correctionRefusal(e, original, user, { signedByCorrector });
};

const completionCheck: Check<EntryInput<"run.complete">> = async (db, e, batch, user, ahead) => {
  if (!e.runId) return { code: "bad_request:run", message: "A procedure entry must name its run." };
  const runId = e.runId;
  const stored = (
    await db
      .select()
      .from(entries)
      .where(or(eq(entries.runId, runId), eq(entries.id, runId)))
  ).map(toStoredRow);
  const sent = [...batch.values()].filter((x) => x.runId === runId || x.id === runId);
  const list: RunEntry[] = [...stored, ...sent];
  const start = list.find((x) => isKind(x, "run.start") && x.id === runId);
  if (!start || !isKind(start, "run.start"))
    return {
      code: "bad_request:run",
      message: "The run this entry belongs to has not reached the server; send its start first.",
    };
  const [t] = await db.select().from(procedureTemplates).where(eq(procedureTemplates.id, start.payload.templateId));
  if (!t)
    return { code: "bad_request:run", message: "The procedure template version of this run is not on the server." };
  const template: PinnedTemplate = { id: t.id, key: t.key, version: t.version, title: t.title, steps: t.steps };
  const state = deriveRun(runId, template, list);
  const completionSigned = await signedWith(db, e, user.id, ["performed"], ahead);
  return completionRefusal(state, { completionSigned });
};

/** A field setting within the magnet's rating and the ramp limit, or with a reason for the override. */
const magnetLimitCheck: Check<EntryInput<"field.setting">> = async (db, e) => {
  if (!e.cryostatId) return null;
  const [c] = await db.select({ config: cryostats.config }).from(cryostats).where(eq(cryostats.id, e.cryostatId));
  const magnet = c?.config.magnet;
  if (!magnet) return null; // placeRefusal answers a cryostat without a magnet
  const [rules] = await db
    .select({ values: facilityRules.values })
    .from(facilityRules)
    .orderBy(desc(facilityRules.version))
    .limit(1);
  return magnetLimitRefusal(e.payload, magnet, rules?.values.maxRampTPerMin[e.cryostatId]);
};

export const recordChecks: LogCheck[] = [
  forKinds(["field.setting"], magnetLimitCheck),
  forKinds(["signature"], signatureCheck),
  { when: (e) => e.supersedes !== null, check: correctionCheck },
  forKinds(["run.complete"], completionCheck),
];
