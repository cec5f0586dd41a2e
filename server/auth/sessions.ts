// Server-side sessions. A sign-in opens a row (db/queries/sessions.ts) whose id the session JWT
// carries; every request that reads the session checks the row: ended (sign-out, an admin, a
// password change) or past its absolute expiry is signed out, whatever copy of the cookie is
// shown. The absolute lifetime is one long shift (RIMELOG_SESSION_HOURS, 14 h by default) and
// no refresh moves it: the JWT's own expiry is capped at it (server/auth/options.ts).
import "server-only";
import { randomUUID } from "node:crypto";
import type { Db } from "@/db/client";
import { endSession, endUserSessions, sessionWithUser, startSession, touchSession } from "@/db/queries/sessions";
import { env } from "@/lib/env";
import type { SessionUser } from "@/lib/schemas/user";

/** The absolute lifetime of a session, in seconds. */
export function sessionLifetimeS(): number {
  return Math.round(env().RIMELOG_SESSION_HOURS * 3600);
}

/** `last_seen_at` is written at most this often per session. */
const TOUCH_EVERY_MS = 60_000;

export type LiveSession = {
  sessionId: string;
  user: SessionUser;
  mustChangePassword: boolean;
  sessionVersion: number;
  expiresAt: Date;
};

export async function openSession(
  db: Db,
  { userId, deviceId }: { userId: string; deviceId?: string | null },
  now = new Date(),
): Promise<{ id: string; expiresAt: Date }> {
  const expiresAt = new Date(now.getTime() + sessionLifetimeS() * 1000);
  const row = await startSession(db, { id: randomUUID(), userId, now, expiresAt, deviceId: deviceId ?? null });
  return { id: row.id, expiresAt: row.expiresAt };
}

/**
 * The session if it is live: not ended, not past its absolute expiry, its user active and (when
 * the token carries one) of the same session version. Null otherwise.
 */
export async function liveSession(
  db: Db,
  { id, sessionVersion }: { id: string | undefined | null; sessionVersion?: number | undefined },
  now = new Date(),
): Promise<LiveSession | null> {
  if (!id) return null;
  const row = await sessionWithUser(db, { id });
  if (!row) return null;
  const { session, user } = row;
  if (session.endedAt || session.expiresAt.getTime() <= now.getTime() || !user.active) return null;
  if (sessionVersion !== undefined && sessionVersion !== user.sessionVersion) return null;
  if (now.getTime() - session.lastSeenAt.getTime() > TOUCH_EVERY_MS) await touchSession(db, { id, now });
  return {
    sessionId: session.id,
    user: { id: user.id, email: user.email, name: user.name, role: user.role },
    mustChangePassword: user.mustChangePassword,
    sessionVersion: user.sessionVersion,
    expiresAt: session.expiresAt,
  };
}

export async function closeSession(db: Db, id: string | undefined | null, reason = "sign-out"): Promise<boolean> {
  return id ? endSession(db, { id, now: new Date(), reason }) : false;
}

/** End every open session of a person (`except` one: the caller's own, on a password change). */
export async function closeUserSessions(
  db: Db,
  userId: string,
  reason: "admin" | "password",
  except?: string,
): Promise<number> {
  return endUserSessions(db, { userId, now: new Date(), reason, ...(except ? { except } : {}) });
}
