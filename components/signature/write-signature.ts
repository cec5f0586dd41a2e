"use client";
// Writing a signature through the tablet store: bound to the exact stored record (recordHash of
// what the store wrote), with the identity proof made for that record and meaning.
import { type EntryDraft, type RecordedOf, recordEntry, recordSigned, type StoredLocalEntry } from "@/lib/local/record";
import type { SignatureMeaning, UncheckedEntry } from "@/lib/schemas/entry";
import type { SessionUser } from "@/lib/schemas/user";
import { signaturePayload, signingSubject } from "@/lib/signing/sign";
import type { Confirmation } from "./sign-dialog";

/** The signature draft for `target`, with the proof made for exactly that record and meaning. */
async function signatureDraft(
  target: UncheckedEntry,
  me: SessionUser,
  meaning: SignatureMeaning,
  c: Confirmation,
): Promise<EntryDraft<"signature">> {
  const subject = signingSubject(target, me, meaning);
  const proof = await c.prove(subject);
  return {
    cryostatId: target.cryostatId,
    runId: target.runId ?? undefined,
    kind: "signature",
    payload: signaturePayload(subject, me, c.confirmedBy, proof, c.image),
  };
}

export async function writeSignature(
  target: StoredLocalEntry,
  me: SessionUser,
  meaning: SignatureMeaning,
  c: Confirmation,
): Promise<StoredLocalEntry> {
  return recordEntry(await signatureDraft(target, me, meaning, c));
}

/**
 * Record the drafts and sign each with the same meaning and confirmation, in one write (all or
 * none): a completion (and the transfer record it makes), a correction of another's record.
 */
export async function recordAndSign<const D extends readonly EntryDraft[]>(
  drafts: D,
  me: SessionUser,
  meaning: SignatureMeaning,
  c: Confirmation,
): Promise<RecordedOf<D>> {
  return recordSigned(drafts, (entry) => signatureDraft(entry, me, meaning, c));
}
