// The record's rules: what makes an entry acceptable beyond its schema. Pure functions over facts
// the caller has looked up (the corrected record, the run's state, the signed record, the
// cryostat, the clock), so the tablet runs them to guide its user and the server runs the same
// ones to decide (db/queries/record-checks.ts). A refusal says what went wrong and what to do;
// the server sends it back per entry and the tablet shows it beside the entry.
import { mayWrite, type Role } from "@/lib/auth/permissions";
import type { RunState } from "@/lib/procedures/state";
import type { CryostatConfig } from "@/lib/schemas/cryostat";
import type { EntryKind, SignatureMeaning, UncheckedEntry } from "@/lib/schemas/entry";
import { chainOf, recordHash } from "@/lib/sync/hash";

export type Refusal = { code: string; message: string };

/** Who is writing: the signed-in user as the server knows them (never what the payload says). */
export type Actor = { id: string; name: string; role: Role };

const refuse = (code: string, message: string): Refusal => ({ code, message });

// ---------------------------------------------------------------------------------------------
// Text PostgreSQL can store.

/** A UTF-16 surrogate half without its partner: no valid Unicode, refused by PostgreSQL's jsonb. */
const LONE_SURROGATE = /[\uD800-\uDBFF](?![\uDC00-\uDFFF])|(?<![\uD800-\uDBFF])[\uDC00-\uDFFF]/;

/**
 * The path of the first string (value or key, at any depth) that PostgreSQL cannot store — a
 * NUL character (U+0000) or a lone surrogate — or null when every string is storable.
 */
export function unstorableTextAt(value: unknown, path = ""): string | null {
  if (typeof value === "string")
    return value.includes("\u0000") || LONE_SURROGATE.test(value) ? path || "(text)" : null;
  if (Array.isArray(value)) {
    for (const [i, v] of value.entries()) {
      const bad = unstorableTextAt(v, `${path}[${i}]`);
      if (bad) return bad;
    }
    return null;
  }
  if (value && typeof value === "object") {
    for (const [k, v] of Object.entries(value)) {
      const at = path ? `${path}.${k}` : k;
      if (k.includes("\u0000") || LONE_SURROGATE.test(k)) return at;
      const bad = unstorableTextAt(v, at);
      if (bad) return bad;
    }
  }
  return null;
}

export function textRefusal(raw: unknown): Refusal | null {
  const at = unstorableTextAt(raw);
  return at
    ? refuse(
        "bad_request:text",
        `The field "${at}" holds a character that cannot be stored (a NUL or a broken character, often from pasting). Retype that text and save again.`,
      )
    : null;
}

// ---------------------------------------------------------------------------------------------
// Time.

/**
 * How far an entry's time may lie ahead of the server's clock. Tablets' clocks drift and are set
 * by hand in basements; ten minutes covers an unsynchronised tablet without letting an entry
 * dated next year become the room's "last entry" for good. (Entries in the past are fine: a
 * tablet may have been offline for days.)
 */
export const FUTURE_BOUND_MS = 10 * 60 * 1000;

export function timeRefusal(e: Pick<UncheckedEntry, "recordedAt">, nowMs: number): Refusal | null {
  const at = Date.parse(e.recordedAt);
  if (at - nowMs > FUTURE_BOUND_MS)
    return refuse(
      "bad_request:time",
      `This entry is dated ${e.recordedAt}, more than ${FUTURE_BOUND_MS / 60_000} minutes ahead of the server's clock. Set the tablet's date and time, then write it again.`,
    );
  return null;
}

// ---------------------------------------------------------------------------------------------
// Place: which chain an entry may go on, and what the cryostat can hold.

/** Roles that may write to the facility chain (entries that belong to no cryostat). */
export const FACILITY_CHAIN_ROLES: readonly Role[] = ["facility_admin", "safety_officer"];
/** Kinds that only make sense on a cryostat with a magnet. */
export const MAGNET_KINDS: readonly EntryKind[] = ["quench", "field.setting"];

export function placeRefusal(
  e: Pick<UncheckedEntry, "kind" | "cryostatId">,
  actor: Pick<Actor, "role">,
  cryostat: { name: string; config: Pick<CryostatConfig, "magnet"> } | null,
): Refusal | null {
  if (!mayWrite(actor.role, e.kind))
    return refuse(
      "forbidden:kind",
      `A ${actor.role.replace("_", " ")} may not record entries of kind "${e.kind}". Ask someone whose role records them.`,
    );
  if (e.cryostatId === null) {
    if (!FACILITY_CHAIN_ROLES.includes(actor.role) && e.kind !== "signature")
      return refuse(
        "forbidden:chain",
        "Entries that belong to no cryostat are made by the facility admin or the safety officer. Choose the cryostat this entry is about.",
      );
    if (MAGNET_KINDS.includes(e.kind))
      return refuse("bad_request:magnet", "A field setting or quench belongs to a cryostat with a magnet.");
    return null;
  }
  if (!cryostat) return refuse("bad_request:cryostat", `Unknown cryostat "${e.cryostatId}".`);
  if (MAGNET_KINDS.includes(e.kind) && !cryostat.config.magnet)
    return refuse(
      "bad_request:magnet",
      `${cryostat.name} has no magnet, so it cannot have a ${e.kind === "quench" ? "quench" : "field setting"}. Check the cryostat chosen.`,
    );
  return null;
}

// ---------------------------------------------------------------------------------------------
// Corrections. The log is append-only: a correction is a new entry that names the one it
// replaces (supersedes) and says why; the original is kept and shown beside it.

/** Kinds that can be corrected. Signatures, run starts and ends, findings and admin changes are not: a new one is written instead. */
export const CORRECTABLE_KINDS: readonly EntryKind[] = [
  "note",
  "reading",
  "helium.level",
  "field.setting",
  "state",
  "handover",
  "transfer",
  "quench",
  "incident",
  "run.step",
];

/**
 * May `actor` write `correction` of `original`? Own records: yes, with a reason. Another
 * person's record: only with a reason and the corrector's own signature on the correction,
 * sent with it (`signedByCorrector`). Never a change of kind, cryostat or run.
 */
export function correctionRefusal(
  correction: Pick<UncheckedEntry, "kind" | "cryostatId" | "runId" | "reason">,
  original: Pick<UncheckedEntry, "kind" | "cryostatId" | "runId" | "authorId"> | undefined,
  actor: Pick<Actor, "id">,
  { signedByCorrector }: { signedByCorrector: boolean },
): Refusal | null {
  if (!original) return refuse("bad_request:supersedes", "The corrected entry is not on the server; send it first.");
  if (!correction.reason?.trim())
    return refuse("bad_request:reason", "A correction needs a reason: say what was wrong.");
  if (!CORRECTABLE_KINDS.includes(original.kind))
    return refuse("bad_request:supersedes", `A ${original.kind} entry cannot be corrected; write a new one instead.`);
  if (correction.kind !== original.kind)
    return refuse(
      "bad_request:supersedes",
      `A correction keeps the kind of the record it corrects (${original.kind}, not ${correction.kind}). Write a separate ${correction.kind} entry instead.`,
    );
  if (correction.cryostatId !== original.cryostatId)
    return refuse("bad_request:supersedes", "A correction must belong to the same cryostat as the entry it corrects.");
  if (correction.runId !== original.runId)
    return refuse(
      "bad_request:supersedes",
      "A correction must belong to the same procedure run as the entry it corrects.",
    );
  if (original.authorId !== actor.id && !signedByCorrector)
    return refuse(
      "forbidden:correction",
      "This record was written by someone else: correcting it needs your signature (with your PIN or password) on the correction.",
    );
  return null;
}

// ---------------------------------------------------------------------------------------------
// Runs.

/**
 * May a run be marked complete? Every required step done, every hold point released by a role
 * allowed to release it (deriveRun counts only those), the run still open, and the completion
 * signed by the person completing it (`completionSigned`: a "performed" signature sent with it).
 */
export function completionRefusal(
  state: RunState,
  { completionSigned }: { completionSigned: boolean },
): Refusal | null {
  if (!state.start)
    return refuse("bad_request:run", "The run this entry belongs to has not reached the server; send its start first.");
  if (state.status !== "open")
    return refuse("conflict:run", `This run is already ${state.status}; it cannot be completed again.`);
  if (state.blockingHold !== null) {
    const hold = state.steps[state.blockingHold];
    const role = hold?.step.kind === "hold" ? hold.step.role.replace("_", " ") : "the required role";
    return refuse(
      "forbidden:run",
      `A hold point is not signed yet (by the ${role}). It must be signed before the run is complete.`,
    );
  }
  const open = state.progress.required - state.progress.done;
  if (open > 0)
    return refuse(
      "forbidden:run",
      `${open} required step${open === 1 ? " is" : "s are"} not done. Finish ${open === 1 ? "it" : "them"} before completing the run.`,
    );
  if (!completionSigned)
    return refuse(
      "forbidden:run",
      "The completion must be signed (with your PIN or password) by the person completing the run.",
    );
  return null;
}

// ---------------------------------------------------------------------------------------------
// Signatures.

export type SignatureFacts = {
  /** The signature entry as sent. */
  signature: Pick<UncheckedEntry, "cryostatId" | "authorId"> & {
    payload: {
      signedEntryId: string;
      signedHash: string;
      meaning: SignatureMeaning;
      signerName: string;
      signerRole: string;
      confirmedBy?: string;
      confirmProof?: string;
    };
  };
  /** The record it signs, if the server (or the batch) holds it. */
  target: UncheckedEntry | undefined;
  /** True when this signer has already signed this record with this meaning. */
  alreadySigned: boolean;
};

/**
 * What a signature is: the signed-in user signing one record's exact content on that record's
 * chain, once per meaning, with a proof of identity (PIN or password). The signer's name and role
 * on the signature are the user record's, not free text.
 */
export function signatureRefusal({ signature, target, alreadySigned }: SignatureFacts, actor: Actor): Refusal | null {
  const p = signature.payload;
  if (signature.authorId !== actor.id)
    return refuse("forbidden:signature", "A signature can only be sent from the signer's own session.");
  if (p.signerRole !== actor.role)
    return refuse("forbidden:signature", "The signer's role does not match the signed-in user's role.");
  if (p.signerName !== actor.name)
    return refuse(
      "forbidden:signature",
      `A signature carries the signer's name as the facility knows it (${actor.name}), not "${p.signerName}".`,
    );
  if (!target)
    return refuse("bad_request:signature", "The signed record is not on the server; send it first (or together).");
  if (chainOf(target.cryostatId) !== chainOf(signature.cryostatId))
    return refuse("bad_request:signature", "A signature belongs to the same cryostat (chain) as the record it signs.");
  if (recordHash(target) !== p.signedHash)
    return refuse(
      "conflict:signature",
      "The signature does not match the record's content: the record was changed after signing.",
    );
  if (!p.confirmedBy || !p.confirmProof)
    return refuse("forbidden:signature", "A signature must be confirmed with the signer's PIN or password.");
  if (alreadySigned)
    return refuse(
      "conflict:signature",
      `You have already signed this record as "${p.meaning}"; a second copy is not stored.`,
    );
  return null;
}
