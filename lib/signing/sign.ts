// Building a signature entry for a record: the hash it binds to (recordHash of the exact record,
// RFC 8785 canonical JSON) and the identity proof made just before. The signature travels as an
// ordinary log entry through the outbox and is re-checked by the server.
import type { EntryInput, SignatureMeaning } from "@/lib/schemas/entry";
import type { Role } from "@/lib/auth/permissions";
import { recordHash } from "@/lib/sync/hash";
import type { ConfirmedBy, SigningSubject } from "./proof";

export type Signer = { id: string; name: string; role: Role };

/** Decide the signature's id and what it binds, before the signer is asked for their secret. */
export function signingSubject(target: EntryInput, signer: Signer, meaning: SignatureMeaning, signatureId: string = crypto.randomUUID()): SigningSubject {
  return { signatureId, signedEntryId: target.id, signedHash: recordHash(target), meaning, signerId: signer.id };
}

export function signatureEntry(args: {
  target: EntryInput;
  subject: SigningSubject;
  signer: Signer;
  deviceId: string;
  image?: string;
  confirmedBy: ConfirmedBy;
  proof: string;
  recordedAt?: string;
}): EntryInput {
  const { target, subject, signer } = args;
  return {
    id: subject.signatureId,
    cryostatId: target.cryostatId,
    runId: target.runId,
    kind: "signature",
    payload: {
      signedEntryId: subject.signedEntryId,
      meaning: subject.meaning,
      signerName: signer.name,
      signerRole: signer.role,
      signedHash: subject.signedHash,
      ...(args.image ? { image: args.image } : {}),
      confirmedBy: args.confirmedBy,
      confirmProof: args.proof,
    },
    authorId: signer.id,
    deviceId: args.deviceId,
    recordedAt: args.recordedAt ?? new Date().toISOString(),
    supersedes: null,
    reason: null,
  };
}
