// Signing secrets on the server: setting the signing PIN (POST /api/pin), the verifier a tablet
// caches to recognise it offline (GET /api/pin), and the proof for a signature confirmed with the
// password (POST /api/pin/confirm). Both changes need the password again, checked and throttled
// like a sign-in, so an unattended session can do neither. How the proofs work: lib/signing/README.md.
import "server-only";
import { randomBytes } from "node:crypto";
import type { Db } from "@/db";
import { setPinRecord, signingSecrets } from "@/db/queries/runs";
import { AppError } from "@/lib/errors";
import type { SignatureMeaning } from "@/lib/schemas/entry";
import type { SessionUser } from "@/lib/schemas/user";
import { pinProblem } from "@/lib/signing/pin-rules";
import {
  derivePinKey,
  formatPinRecord,
  hmacHex,
  PIN_ITERATIONS,
  PIN_LIFETIME_MS,
  parsePinRecord,
  passwordProofKey,
  signingMessage,
  verifierOf,
} from "@/lib/signing/proof";
import { SignInError, SignInLimited, verifySignIn } from "@/server/auth/credentials";

export type PinVerifier = { saltB64: string; iterations: number; verifier: string; expiresAt: string };

/** What the tablet caches: enough to recognise the PIN, never enough to make a proof. */
function verifierFor(record: string | null): PinVerifier | null {
  const pin = parsePinRecord(record);
  if (!pin) return null;
  return {
    saltB64: pin.saltB64,
    iterations: pin.iterations,
    verifier: verifierOf(pin.keyHex),
    expiresAt: new Date(Date.now() + PIN_LIFETIME_MS).toISOString(),
  };
}

/** The user's PIN verifier with a new expiry (same PIN), or null when no PIN is set. */
export async function currentPinVerifier(db: Db, user: SessionUser): Promise<PinVerifier | null> {
  const secrets = await signingSecrets(db, { userId: user.id });
  return verifierFor(secrets?.pinHash ?? null);
}

async function checkPassword(db: Db, user: SessionUser, password: string, refusal: (e: SignInError) => AppError) {
  try {
    await verifySignIn(db, { email: user.email, password });
  } catch (e) {
    if (e instanceof SignInLimited) throw new AppError("rate_limited", "password", e.message);
    if (e instanceof SignInError) throw refusal(e);
    throw e;
  }
}

/** Set or change the signing PIN (its rules: lib/signing/pin-rules.ts); answers the new verifier. */
export async function setPin(db: Db, user: SessionUser, input: { password: string; pin: string }) {
  const problem = pinProblem(input.pin);
  if (problem)
    throw new AppError("bad_request", "pin", problem, [`pin: ${problem}`], [{ path: "pin", message: problem }]);
  await checkPassword(db, user, input.password, () => new AppError("forbidden", "pin", "The password did not match."));
  const salt = randomBytes(16).toString("base64");
  const record = formatPinRecord(PIN_ITERATIONS, salt, await derivePinKey(input.pin, salt, PIN_ITERATIONS));
  await setPinRecord(db, { userId: user.id, record });
  return verifierFor(record);
}

/** The proof for one signature of this user, after the password is checked. */
export async function passwordProof(
  db: Db,
  user: SessionUser,
  password: string,
  subject: { signedEntryId: string; signedHash: string; meaning: SignatureMeaning },
): Promise<string> {
  await checkPassword(db, user, password, (e) => new AppError("forbidden", "signature", e.message));
  const secrets = await signingSecrets(db, { userId: user.id });
  if (!secrets) throw new AppError("unauthorized", "session", "Sign in first.");
  return hmacHex(passwordProofKey(secrets.passwordHash), signingMessage({ ...subject, signerId: user.id }));
}
