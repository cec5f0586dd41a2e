// Sign-in limits, as data and one pure rule (the server counts attempts in its database,
// server/auth/credentials.ts). An account is locked after five failed sign-ins within 15 minutes
// (counted since its last successful sign-in); an address after 30 (a room's tablets may share
// one address). While locked, every attempt is refused without checking the password, the
// correct one too, and does not count; the lock lifts as the oldest failures leave the window.

export const SIGN_IN_WINDOW_MS = 15 * 60_000;
export const ACCOUNT_FAILURES = 5;
export const ADDRESS_FAILURES = 30;

/**
 * How long until one more attempt may be checked, given the times (ms) of the failures counted in
 * the window: 0 while fewer than `limit`; else until enough of the oldest have left the window.
 */
export function lockWaitMs(failureTimes: readonly number[], now: number, limit: number, windowMs = SIGN_IN_WINDOW_MS) {
  const recent = failureTimes.filter((t) => t > now - windowMs).sort((a, b) => a - b);
  if (recent.length < limit) return 0;
  // Parallel attempts may be written just after `now` was read: never more than the window.
  return Math.min(windowMs, Math.max(1000, recent[recent.length - limit]! + windowMs - now));
}

/** "Try again in 14 minutes." / "in 40 seconds." — the wait in plain words, rounded up. */
export function waitWords(ms: number): string {
  if (ms < 60_000) {
    const s = Math.max(1, Math.ceil(ms / 1000));
    return `${s} ${s === 1 ? "second" : "seconds"}`;
  }
  const m = Math.ceil(ms / 60_000);
  return `${m} ${m === 1 ? "minute" : "minutes"}`;
}

export function lockMessage(scope: "account" | "address", ms: number): string {
  const who = scope === "account" ? "this account" : "this network address";
  return `Too many failed sign-ins for ${who}. Try again in ${waitWords(ms)}.`;
}
