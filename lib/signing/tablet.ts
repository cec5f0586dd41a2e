// The tablet's side of signing: the PIN verifier cached after an online sign-in (bounded
// lifetime, forgotten after repeated wrong PINs), and turning a typed PIN into a proof for one
// signature. The verifier alone cannot make a proof: the key is re-derived from the typed PIN.
// Limits: anyone who copies the tablet's storage can try PINs against the verifier offline;
// the expiry and the PIN length bound that, they do not remove it (see docs in lib/signing/README.md).
import {
  derivePinKey,
  hmacHex,
  PIN_MAX_FAILURES,
  type SigningSubject,
  sameHex,
  signingMessage,
  verifierOf,
} from "./proof";

export type CachedPin = {
  userId: string;
  saltB64: string;
  iterations: number;
  verifier: string;
  expiresAt: string;
  failures: number;
};

const KEY = (userId: string) => `rimelog-pin:${userId}`;

export function cachedPin(userId: string, now = Date.now()): CachedPin | null {
  try {
    const raw = localStorage.getItem(KEY(userId));
    if (!raw) return null;
    const c = JSON.parse(raw) as CachedPin;
    if (c.userId !== userId || Date.parse(c.expiresAt) <= now) return null;
    return c;
  } catch {
    return null;
  }
}

export function storePin(c: Omit<CachedPin, "failures">): void {
  localStorage.setItem(KEY(c.userId), JSON.stringify({ ...c, failures: 0 }));
}

export function forgetPin(userId: string): void {
  localStorage.removeItem(KEY(userId));
}

export type PinUnlock =
  | { ok: true; key: string }
  | { ok: false; reason: "no_pin" | "expired" | "wrong" | "locked"; left?: number };

/**
 * Check a typed PIN against the cached verifier. On success the derived key is returned to make
 * proofs with (keep it in memory for this one signing only, never store it).
 */
export async function unlockPin(userId: string, pin: string, now = Date.now()): Promise<PinUnlock> {
  let raw: string | null = null;
  try {
    raw = localStorage.getItem(KEY(userId));
  } catch {
    /* storage unavailable: treated as no PIN */
  }
  if (!raw) return { ok: false, reason: "no_pin" };
  const c = JSON.parse(raw) as CachedPin;
  if (Date.parse(c.expiresAt) <= now) return { ok: false, reason: "expired" };
  const key = await derivePinKey(pin, c.saltB64, c.iterations);
  if (!sameHex(verifierOf(key), c.verifier)) {
    const failures = c.failures + 1;
    if (failures >= PIN_MAX_FAILURES) {
      forgetPin(userId);
      return { ok: false, reason: "locked" };
    }
    localStorage.setItem(KEY(userId), JSON.stringify({ ...c, failures }));
    return { ok: false, reason: "wrong", left: PIN_MAX_FAILURES - failures };
  }
  if (c.failures) localStorage.setItem(KEY(userId), JSON.stringify({ ...c, failures: 0 }));
  return { ok: true, key };
}

export function pinProof(key: string, subject: SigningSubject): string {
  return hmacHex(key, signingMessage(subject));
}
