// Server-side sessions: one row per sign-in, read on every request that reads the session. Times
// are passed in (never the database's now()), so the checks and the tests share one clock.
import { and, eq, isNull, ne } from "drizzle-orm";
import type { Db } from "@/db/client";
import { type SessionRow, sessions, type User, users } from "@/db/schema";

export async function startSession(
  db: Db,
  s: { id: string; userId: string; now: Date; expiresAt: Date; deviceId?: string | null },
): Promise<SessionRow> {
  const [row] = await db
    .insert(sessions)
    .values({
      id: s.id,
      userId: s.userId,
      createdAt: s.now,
      expiresAt: s.expiresAt,
      lastSeenAt: s.now,
      deviceId: s.deviceId ?? null,
    })
    .returning();
  return row!;
}

/** The session and its user in one read, whatever their state (the caller decides what is live). */
export async function sessionWithUser(
  db: Db,
  { id }: { id: string },
): Promise<{ session: SessionRow; user: User } | null> {
  const [row] = await db
    .select()
    .from(sessions)
    .innerJoin(users, eq(users.id, sessions.userId))
    .where(eq(sessions.id, id));
  return row ? { session: row.sessions, user: row.users } : null;
}

/** Note that the session was used (the caller calls this at most every few minutes). */
export async function touchSession(db: Db, { id, now }: { id: string; now: Date }): Promise<void> {
  await db.update(sessions).set({ lastSeenAt: now }).where(eq(sessions.id, id));
}

export async function endSession(
  db: Db,
  { id, now, reason }: { id: string; now: Date; reason: string },
): Promise<boolean> {
  const ended = await db
    .update(sessions)
    .set({ endedAt: now, endedReason: reason })
    .where(and(eq(sessions.id, id), isNull(sessions.endedAt)))
    .returning({ id: sessions.id });
  return ended.length > 0;
}

/** End every open session of a person (admin, password change); answers how many ended. */
export async function endUserSessions(
  db: Db,
  { userId, now, reason, except }: { userId: string; now: Date; reason: string; except?: string },
): Promise<number> {
  const ended = await db
    .update(sessions)
    .set({ endedAt: now, endedReason: reason })
    // `except` keeps the caller's own session (a password change ends the others, not its own).
    .where(and(eq(sessions.userId, userId), isNull(sessions.endedAt), except ? ne(sessions.id, except) : undefined))
    .returning({ id: sessions.id });
  return ended.length;
}
