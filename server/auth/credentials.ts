// Checking a sign-in, with the limits per account and per address counted in the database
// (lib/auth/sign-in-limits.ts has the numbers). Each attempt is written before its password is
// checked, so parallel attempts count each other and several app processes share one count; a
// locked account or address is refused without checking the password (the correct one too).
import "server-only";
import { AsyncLocalStorage } from "node:async_hooks";
import bcrypt from "bcryptjs";
import type { Db } from "@/db/client";
import { failureTimes, findUserByEmail, reserveSignInAttempt, settleSignInAttempt } from "@/db/queries/users";
import {
  ACCOUNT_FAILURES,
  ADDRESS_FAILURES,
  lockMessage,
  lockWaitMs,
  SIGN_IN_WINDOW_MS,
} from "@/lib/auth/sign-in-limits";
import type { SessionUser } from "@/lib/schemas/user";

/**
 * bcrypt cost for new and changed passwords: 2^12 rounds (bcryptjs, pure JavaScript: about a
 * quarter of a second a hash on one core of the 2-core machines this runs on). A stored hash keeps
 * the cost it was made with (the demo's seed uses 10).
 */
export const BCRYPT_COST = 12;

export class SignInError extends Error {}

/** Refused by a limit before the password was checked; `waitMs` until one more attempt is checked. */
export class SignInLimited extends SignInError {
  constructor(
    readonly scope: "account" | "address",
    readonly waitMs: number,
  ) {
    super(lockMessage(scope, waitMs));
  }
}

export type SignedInUser = SessionUser & { mustChangePassword: boolean; sessionVersion: number };

/** The caller's address: the first X-Forwarded-For hop (Next sets it from the socket when absent). */
export function clientAddress(headers: Headers | Record<string, string | string[] | undefined>): string | null {
  const raw = headers instanceof Headers ? headers.get("x-forwarded-for") : headers["x-forwarded-for"];
  const first = (Array.isArray(raw) ? raw[0] : raw)?.split(",")[0]?.trim();
  return first ? first.slice(0, 100) : null;
}

/**
 * Count one attempt for this account and address, or throw `SignInLimited` (the attempt is kept,
 * marked as limited, and does not count). Answers the attempt's id, to settle once checked.
 */
export async function reserveAttempt(
  db: Db,
  { email, address }: { email: string; address: string | null },
  now = new Date(),
): Promise<string> {
  const id = await reserveSignInAttempt(db, { email, address, now });
  const since = new Date(now.getTime() - SIGN_IN_WINDOW_MS);
  const account = lockWaitMs(await failureTimes(db, { email, since, except: id }), now.getTime(), ACCOUNT_FAILURES);
  const byAddress = address
    ? lockWaitMs(await failureTimes(db, { address, since, except: id }), now.getTime(), ADDRESS_FAILURES)
    : 0;
  if (account || byAddress) {
    await settleSignInAttempt(db, { id, ok: false, limited: true });
    throw new SignInLimited(account >= byAddress ? "account" : "address", Math.max(account, byAddress));
  }
  return id;
}

/** An attempt reserved by the sign-in route (app/api/auth/[...nextauth]) for next-auth's authorize. */
const reserved = new AsyncLocalStorage<{ id: string; used: boolean }>();

export function withReservedAttempt<T>(id: string, fn: () => Promise<T>): Promise<T> {
  return reserved.run({ id, used: false }, fn);
}

function takeReserved(): string | null {
  const r = reserved.getStore();
  if (!r || r.used) return null;
  r.used = true;
  return r.id;
}

let dummyHash: Promise<string> | undefined;

export async function verifySignIn(
  db: Db,
  { email, password, address = null }: { email: string; password: string; address?: string | null },
): Promise<SignedInUser> {
  const id = takeReserved() ?? (await reserveAttempt(db, { email, address }));
  const user = await findUserByEmail(db, { email });
  // Compare against a dummy hash of the same cost when the user is unknown, so timing does not reveal accounts.
  dummyHash ??= bcrypt.hash("no account has this password", BCRYPT_COST);
  const ok = await bcrypt.compare(password, user?.passwordHash ?? (await dummyHash));
  await settleSignInAttempt(db, { id, ok: Boolean(user && ok && user.active) });
  if (!user || !ok) {
    throw new SignInError(
      `Email or password did not match. After ${ACCOUNT_FAILURES} failed attempts the account is locked for ${SIGN_IN_WINDOW_MS / 60_000} minutes.`,
    );
  }
  if (!user.active) throw new SignInError("This account is disabled. Ask the facility admin.");
  return {
    id: user.id,
    email: user.email,
    name: user.name,
    role: user.role,
    mustChangePassword: user.mustChangePassword,
    sessionVersion: user.sessionVersion,
  };
}
