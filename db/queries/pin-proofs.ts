// Refused PIN proofs, counted by the server (a tablet guessing a PIN shows up here).
import type { Db } from "@/db/client";
import { pinProofRejections } from "@/db/schema";

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
