// The identity check behind a signature (the stylus image alone never signs): the signer proves,
// just before signing, that they know their PIN or password. The proof is an HMAC over exactly what
// is being signed, so it cannot be moved to another record or meaning, and the server re-verifies
// it on push. Runs on tablet and server.
//
// PIN:      K = PBKDF2-SHA256(PIN, salt, iterations). The server keeps K (like a password hash);
//           the tablet keeps only verifier = SHA-256(K), with an expiry. Proof = HMAC(K, message).
// Password: checked by the server while online; proof = HMAC(key derived from the stored bcrypt
//           hash, message). The tablet never holds anything that can make a password proof.
import { hmac } from "@noble/hashes/hmac.js";
import { sha256 } from "@noble/hashes/sha2.js";
import { bytesToHex, hexToBytes, utf8ToBytes } from "@noble/hashes/utils.js";
import type { SignatureMeaning } from "@/lib/schemas/entry";

/** OWASP's 2023 figure for PBKDF2-HMAC-SHA256; WebCrypto does this in well under a second. */
export const PIN_ITERATIONS = 600_000;
/** How long a PIN verifier cached on a tablet stays usable without seeing the server again. */
export const PIN_LIFETIME_MS = 48 * 60 * 60 * 1000;
/** Wrong PINs in a row before the tablet forgets the verifier (the password is needed again). */
export const PIN_MAX_FAILURES = 5;
export const PIN_PATTERN = /^[0-9]{6,12}$/;

export type ConfirmedBy = "pin" | "password";

export type SigningSubject = { signedEntryId: string; signedHash: string; meaning: SignatureMeaning; signerId: string };

/**
 * The exact text a proof covers: the record (by id and content hash), the meaning and the signer.
 * The signature entry's own id is left out because the tablet store assigns it on write; a proof
 * replayed onto a second signature could only repeat the same person's same meaning on the same
 * record content, which adds nothing.
 */
export function signingMessage(s: SigningSubject): string {
  return ["rimelog-sign/v1", s.signedEntryId, s.signedHash, s.meaning, s.signerId].join("|");
}

export function hmacHex(keyHex: string, message: string): string {
  return bytesToHex(hmac(sha256, hexToBytes(keyHex), utf8ToBytes(message)));
}

/** What the tablet stores to recognise a PIN, from the derived key (never the key itself). */
export function verifierOf(keyHex: string): string {
  return bytesToHex(sha256(utf8ToBytes(`rimelog-pin-verifier|${keyHex}`)));
}

/** PBKDF2-SHA256 through WebCrypto (browser and Node 20 alike). */
export async function derivePinKey(pin: string, saltB64: string, iterations: number): Promise<string> {
  const subtle = globalThis.crypto.subtle;
  const base = await subtle.importKey("raw", utf8ToBytes(pin.normalize("NFC")) as BufferSource, "PBKDF2", false, [
    "deriveBits",
  ]);
  const salt = Uint8Array.from(atob(saltB64), (c) => c.charCodeAt(0));
  const bits = await subtle.deriveBits({ name: "PBKDF2", hash: "SHA-256", salt, iterations }, base, 256);
  return bytesToHex(new Uint8Array(bits));
}

/** The server's password-proof key for one user: tied to the current password hash. */
export function passwordProofKey(passwordHash: string): string {
  return bytesToHex(sha256(utf8ToBytes(`rimelog-password-confirm|${passwordHash}`)));
}

/** Constant-time comparison of two hex strings. */
export function sameHex(a: string, b: string): boolean {
  if (a.length !== b.length) return false;
  let diff = 0;
  for (let i = 0; i < a.length; i++) diff |= a.charCodeAt(i) ^ b.charCodeAt(i);
  return diff === 0;
}

/** Stored PIN record on the users row: `pbkdf2-sha256$iterations$saltB64$keyHex`. */
export function formatPinRecord(iterations: number, saltB64: string, keyHex: string): string {
  return `pbkdf2-sha256$${iterations}$${saltB64}$${keyHex}`;
}

export function parsePinRecord(
  record: string | null | undefined,
): { iterations: number; saltB64: string; keyHex: string } | null {
  if (!record) return null;
  const [scheme, it, saltB64, keyHex] = record.split("$");
  if (scheme !== "pbkdf2-sha256" || !it || !saltB64 || !keyHex || !/^[0-9a-f]{64}$/.test(keyHex)) return null;
  const iterations = Number(it);
  return Number.isInteger(iterations) && iterations > 0 ? { iterations, saltB64, keyHex } : null;
}

/**
 * Server side: does `proof` show that the signer confirmed this exact signature?
 * `pinRecord` and `passwordHash` come from the signer's users row.
 */
export function verifyConfirmation(
  subject: SigningSubject,
  confirmedBy: ConfirmedBy,
  proof: string,
  signer: { pinRecord: string | null; passwordHash: string },
): boolean {
  const message = signingMessage(subject);
  if (confirmedBy === "password") return sameHex(hmacHex(passwordProofKey(signer.passwordHash), message), proof);
  const pin = parsePinRecord(signer.pinRecord);
  return pin ? sameHex(hmacHex(pin.keyHex, message), proof) : false;
}
