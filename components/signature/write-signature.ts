"use client";
// Writing a signature through the tablet store: bound to the exact stored record (recordHash of
// what the store wrote), with the identity proof made for that record and meaning.
import { type EntryDraft, recordEntry, recordSigned, type StoredLocalEntry } from "@/lib/local/record";
import type { EntryKind, SignatureMeaning, UncheckedEntry } from "@/lib/schemas/entry";
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

/** Record `draft` and sign it in one write (both or neither): a completion, a correction of another's record. */
export async function recordAndSign<K extends EntryKind>(
  draft: EntryDraft<K>,
  me: SessionUser,
  meaning: SignatureMeaning,
  c: Confirmation,
): Promise<StoredLocalEntry<K>> {
  const [record] = await recordSigned(draft, (entry) => signatureDraft(entry, me, meaning, c));
  return record;
}
