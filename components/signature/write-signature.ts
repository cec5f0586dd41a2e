"use client";
// Writing a signature through the tablet store: bound to the exact stored record (recordHash of
// what the store wrote), with the identity proof made for that record and meaning.
import { recordEntry, type StoredLocalEntry } from "@/lib/local/record";
import type { SignatureMeaning } from "@/lib/schemas/entry";
import type { SessionUser } from "@/lib/schemas/user";
import { signaturePayload, signingSubject } from "@/lib/signing/sign";
import type { Confirmation } from "./sign-dialog";

export async function writeSignature(
  target: StoredLocalEntry,
  me: SessionUser,
  meaning: SignatureMeaning,
  c: Confirmation,
): Promise<StoredLocalEntry> {
  const subject = signingSubject(target, me, meaning);
  const proof = await c.prove(subject);
  return recordEntry({
    cryostatId: target.cryostatId,
    runId: target.runId ?? undefined,
    kind: "signature",
    payload: signaturePayload(subject, me, c.confirmedBy, proof, c.image),
  });
}
