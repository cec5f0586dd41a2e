// Building a signature entry for a record: the hash it binds to (recordHash of the exact record,
// RFC 8785 canonical JSON) and the identity proof made just before. The signature travels as an
// ordinary log entry through the outbox and is re-checked by the server.

import type { Role } from "@/lib/auth/permissions";
import type { EntryInputOf, Payload, SignatureMeaning, UncheckedEntry } from "@/lib/schemas/entry";
import { recordHash } from "@/lib/sync/hash";
import type { ConfirmedBy, SigningSubject } from "./proof";

export type Signer = { id: string; name: string; role: Role };

/** What a signature binds: the exact record (id + recordHash), the meaning and the signer. */
export function signingSubject(target: UncheckedEntry, signer: Signer, meaning: SignatureMeaning): SigningSubject {
  return { signedEntryId: target.id, signedHash: recordHash(target), meaning, signerId: signer.id };
}

/** The signature's payload, as the tablet store's recordEntry takes it. */
export function signaturePayload(
  subject: SigningSubject,
  signer: Signer,
  confirmedBy: ConfirmedBy,
  proof: string,
  image?: string,
): Payload<"signature"> {
  return {
    signedEntryId: subject.signedEntryId,
    meaning: subject.meaning,
    signerName: signer.name,
    signerRole: signer.role,
    signedHash: subject.signedHash,
    ...(image ? { image } : {}),
    confirmedBy,
    confirmProof: proof,
  };
}

export function signatureEntry(args: {
  target: UncheckedEntry;
  subject: SigningSubject;
  signer: Signer;
  deviceId: string;
  image?: string;
  confirmedBy: ConfirmedBy;
  proof: string;
  recordedAt?: string;
}): EntryInputOf<"signature"> {
  const { target, subject, signer } = args;
  return {
    id: crypto.randomUUID(),
    cryostatId: target.cryostatId,
    runId: target.runId,
    kind: "signature",
    payload: signaturePayload(subject, signer, args.confirmedBy, args.proof, args.image),
    authorId: signer.id,
    deviceId: args.deviceId,
    recordedAt: args.recordedAt ?? new Date().toISOString(),
    supersedes: null,
    reason: null,
  };
}
