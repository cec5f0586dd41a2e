// Signature proofs on the server: whether a PIN or password proof checks out against the
// signer's stored secrets, and the count of refused PIN proofs (a tablet guessing a PIN shows up).
import { eq } from "drizzle-orm";
import type { Db } from "@/db/client";
import { pinProofRejections, users } from "@/db/schema";
import type { SignatureMeaning } from "@/lib/schemas/entry";
import { verifyConfirmation } from "@/lib/signing/proof";

type Proof = {
  signedEntryId: string;
  signedHash: string;
  meaning: SignatureMeaning;
  confirmedBy?: "pin" | "password" | undefined;
  confirmProof?: string | undefined;
};

/** Does the signature's proof show that `signerId` confirmed exactly this record and meaning? */
export async function proofChecksOut(db: Db, signerId: string, p: Proof): Promise<boolean> {
  if (!p.confirmedBy || !p.confirmProof) return false;
  const [secrets] = await db
    .select({ pinHash: users.pinHash, passwordHash: users.passwordHash })
    .from(users)
    .where(eq(users.id, signerId));
  if (!secrets) return false;
  return verifyConfirmation(
    { signedEntryId: p.signedEntryId, signedHash: p.signedHash, meaning: p.meaning, signerId },
    p.confirmedBy,
    p.confirmProof,
    { pinRecord: secrets.pinHash, passwordHash: secrets.passwordHash },
  );
}

/**
 * Count a PIN proof the server refused (a signature whose PIN confirmation does not check out).
 * Called where the proof is verified (db/queries/runs.ts `signatureConfirmation`, which checks
 * every signature's proof, audit signatures included).
 */
export async function recordRejectedPinProof(
  db: Db,
  { userId, entryId, now }: { userId: string; entryId: string | null; now: Date },
): Promise<void> {
  await db.insert(pinProofRejections).values({ userId, entryId, at: now });
}
