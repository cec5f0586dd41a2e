// Signatures as a signed-in person makes them, for tests that push through the server's checks:
// confirmed with the person's password (the demo seed's password hash) or a PIN set for the test.
import { randomBytes } from "node:crypto";
import { eq } from "drizzle-orm";
import type { Db } from "@/db/client";
import { users } from "@/db/schema";
import type { SignatureMeaning, UncheckedEntry } from "@/lib/schemas/entry";
import type { SessionUser } from "@/lib/schemas/user";
import { derivePinKey, formatPinRecord, hmacHex, passwordProofKey, signingMessage } from "@/lib/signing/proof";
import { signatureEntry, signingSubject } from "@/lib/signing/sign";

/** A signature of `target` by `signer`, confirmed with the signer's stored password (a proof the server re-checks). */
export async function passwordSignature(
  db: Db,
  target: UncheckedEntry,
  signer: SessionUser,
  meaning: SignatureMeaning,
  over: { deviceId?: string; recordedAt?: string } = {},
) {
  const [row] = await db.select({ passwordHash: users.passwordHash }).from(users).where(eq(users.id, signer.id));
  if (!row) throw new Error(`No user ${signer.id}`);
  const subject = signingSubject(target, signer, meaning);
  return signatureEntry({
    target,
    subject,
    signer,
    deviceId: over.deviceId ?? target.deviceId,
    confirmedBy: "password",
    proof: hmacHex(passwordProofKey(row.passwordHash), signingMessage(subject)),
    ...(over.recordedAt ? { recordedAt: over.recordedAt } : {}),
  });
}

/** Sets a PIN the way POST /api/pin does, with fewer PBKDF2 rounds to keep the test quick. */
export async function setTestPin(db: Db, userId: string, pin: string) {
  const salt = randomBytes(16).toString("base64");
  const key = await derivePinKey(pin, salt, 1000);
  await db
    .update(users)
    .set({ pinHash: formatPinRecord(1000, salt, key) })
    .where(eq(users.id, userId));
  return { key, salt };
}
