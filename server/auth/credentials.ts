// Checking a sign-in. Repeated failures slow further attempts for that account (a growing delay,
// never a lock-out that a stranger could impose on a colleague), and every attempt is recorded.
import "server-only";
import bcrypt from "bcryptjs";
import type { Db } from "@/db/client";
import { findUserByEmail, recentFailures, recordSignInAttempt } from "@/db/queries/users";
import type { SessionUser } from "@/lib/schemas/user";

export const FAILURE_WINDOW_MS = 15 * 60_000;
export const FREE_FAILURES = 5;

export class SignInError extends Error {}

/** Delay before answering, after `failures` recent failures: 0 for the first five, then 1, 2, 4, 8 s. */
export function throttleDelayMs(failures: number): number {
  if (failures < FREE_FAILURES) return 0;
  return Math.min(8000, 1000 * 2 ** (failures - FREE_FAILURES));
}

export async function verifySignIn(
  db: Db,
  { email, password }: { email: string; password: string },
  sleep: (ms: number) => Promise<void> = (ms) => new Promise((r) => setTimeout(r, ms)),
): Promise<SessionUser> {
  const failures = await recentFailures(db, { email, sinceMs: FAILURE_WINDOW_MS });
  const delay = throttleDelayMs(failures);
  if (delay) await sleep(delay);
  const user = await findUserByEmail(db, { email });
  // Compare against a dummy hash when the user is unknown, so timing does not reveal accounts.
  const ok = await bcrypt.compare(
    password,
    user?.passwordHash ?? "$2b$10$CwTycUXWue0Thq9StjUM0uJ8.p8Gvb9Zq5F6qV3X3vYj6FHj6P1yS",
  );
  await recordSignInAttempt(db, { email, ok: Boolean(user && ok && user.active) });
  if (!user || !ok) {
    const slowed =
      failures + 1 >= FREE_FAILURES
        ? " Several attempts have failed: further attempts for this account are slowed down."
        : "";
    throw new SignInError(`Email or password did not match.${slowed}`);
  }
  if (!user.active) throw new SignInError("This account is disabled. Ask the facility admin.");
  return { id: user.id, email: user.email, name: user.name, role: user.role };
}
