// Users: look-ups for sign-in and sessions, the admin's list, adding a person, passwords, and the
// sign-in attempts the limits count (server/auth/credentials.ts) and the audit trail keeps.
import { randomUUID } from "node:crypto";
import { and, asc, count, eq, gt, max, ne } from "drizzle-orm";
import type { Db } from "@/db/client";
import { pinProofRejections, type Role, signInAttempts, type User, users } from "@/db/schema";
import type { AdminUser, PublicUser, SessionUser } from "@/lib/schemas/user";
import { appendEntries } from "./entries";

export { recordRejectedPinProof } from "./pin-proofs";

export type { AdminUser, PublicUser };

export async function findUserByEmail(db: Db, { email }: { email: string }): Promise<User | undefined> {
  const [u] = await db.select().from(users).where(eq(users.email, email.trim().toLowerCase()));
  return u;
}

export async function getUser(db: Db, { id }: { id: string }): Promise<User | undefined> {
  const [u] = await db.select().from(users).where(eq(users.id, id));
  return u;
}

/** Everyone's name and role (what any signed-in user may see). */
export async function listPublicUsers(db: Db): Promise<PublicUser[]> {
  return db
    .select({ id: users.id, name: users.name, role: users.role, active: users.active })
    .from(users)
    .orderBy(asc(users.name));
}

export async function listUsersForAdmin(db: Db): Promise<AdminUser[]> {
  return db
    .select({
      id: users.id,
      name: users.name,
      role: users.role,
      active: users.active,
      email: users.email,
      createdAt: users.createdAt,
    })
    .from(users)
    .orderBy(asc(users.name));
}

export async function createUser(
  db: Db,
  {
    id,
    email,
    name,
    role,
    passwordHash,
  }: { id: string; email: string; name: string; role: Role; passwordHash: string },
): Promise<{ ok: true; user: AdminUser } | { ok: false; reason: "email_taken" }> {
  const [row] = await db
    .insert(users)
    .values({ id, email: email.trim().toLowerCase(), name, role, passwordHash })
    .onConflictDoNothing({ target: users.email })
    .returning();
  if (!row) return { ok: false, reason: "email_taken" };
  return {
    ok: true,
    user: {
      id: row.id,
      name: row.name,
      role: row.role,
      active: row.active,
      email: row.email,
      createdAt: row.createdAt,
    },
  };
}

/** Write an attempt before its password is checked (ok false until `settleSignInAttempt`). */
export async function reserveSignInAttempt(
  db: Db,
  { email, address, now }: { email: string; address: string | null; now: Date },
): Promise<string> {
  const [row] = await db
    .insert(signInAttempts)
    .values({ email: email.trim().toLowerCase(), address, ok: false, at: now })
    .returning({ id: signInAttempts.id });
  return row!.id;
}

export async function settleSignInAttempt(
  db: Db,
  { id, ok, limited = false }: { id: string; ok: boolean; limited?: boolean },
): Promise<void> {
  await db.update(signInAttempts).set({ ok, limited }).where(eq(signInAttempts.id, id));
}

/**
 * Times (ms) of the failed (or not yet settled) attempts since `since`, other than `except`, for
 * one account (counted from its last successful sign-in) or one address; refused-by-a-limit
 * attempts do not count.
 */
export async function failureTimes(
  db: Db,
  { email, address, since, except }: { email?: string; address?: string; since: Date; except: string },
): Promise<number[]> {
  let from = since;
  const who = email ? eq(signInAttempts.email, email.trim().toLowerCase()) : eq(signInAttempts.address, address ?? "");
  if (email) {
    const [last] = await db
      .select({ at: max(signInAttempts.at) })
      .from(signInAttempts)
      .where(and(who, eq(signInAttempts.ok, true), gt(signInAttempts.at, since)));
    if (last?.at && last.at > from) from = last.at;
  }
  const rows = await db
    .select({ at: signInAttempts.at })
    .from(signInAttempts)
    .where(
      and(
        who,
        eq(signInAttempts.ok, false),
        eq(signInAttempts.limited, false),
        gt(signInAttempts.at, from),
        ne(signInAttempts.id, except),
      ),
    );
  return rows.map((r) => r.at.getTime());
}

/** A new password hash; `mustChange` (an admin reset) makes the next sign-in pick another. */
export async function setPassword(
  db: Db,
  { id, passwordHash, mustChange, now }: { id: string; passwordHash: string; mustChange: boolean; now: Date },
): Promise<boolean> {
  const rows = await db
    .update(users)
    .set({ passwordHash, mustChangePassword: mustChange, passwordChangedAt: now })
    .where(eq(users.id, id))
    .returning({ id: users.id });
  return rows.length > 0;
}

export type AccessChange = { role?: Role; active?: boolean };

/**
 * Change a person's role or access. Their session version moves on, so every session they hold
 * ends at its next request; the change is a `user.change` entry on the facility chain, written
 * in the same transaction.
 */
export async function changeUserAccess(
  db: Db,
  admin: SessionUser,
  { id, change, deviceId }: { id: string; change: AccessChange; deviceId: string },
): Promise<{ ok: true; user: AdminUser } | { ok: false; reason: "not_found" | "self" | "no_change" }> {
  if (id === admin.id) return { ok: false, reason: "self" };
  return db.transaction(async (tx) => {
    const t = tx as unknown as Db;
    const [before] = await t.select().from(users).where(eq(users.id, id));
    if (!before) return { ok: false as const, reason: "not_found" as const };
    const changes: { field: "role" | "active"; from: string | boolean; to: string | boolean }[] = [];
    if (change.role !== undefined && change.role !== before.role)
      changes.push({ field: "role", from: before.role, to: change.role });
    if (change.active !== undefined && change.active !== before.active)
      changes.push({ field: "active", from: before.active, to: change.active });
    if (!changes.length) return { ok: false as const, reason: "no_change" as const };
    const [row] = await t
      .update(users)
      .set({
        role: change.role ?? before.role,
        active: change.active ?? before.active,
        sessionVersion: before.sessionVersion + 1,
      })
      .where(eq(users.id, id))
      .returning();
    const res = await appendEntries(t, admin, [
      {
        id: randomUUID(),
        cryostatId: null,
        runId: null,
        kind: "user.change",
        payload: { userId: id, userName: before.name, changes },
        authorId: admin.id,
        deviceId,
        recordedAt: new Date().toISOString(),
        supersedes: null,
        reason: null,
      },
    ]);
    if (res.rejected.length) throw new Error(`audit entry refused: ${res.rejected[0]!.message}`);
    return {
      ok: true as const,
      user: {
        id: row!.id,
        name: row!.name,
        role: row!.role,
        active: row!.active,
        email: row!.email,
        createdAt: row!.createdAt,
      },
    };
  });
}

/** How many PIN proofs of this person were refused since `since`. */
export async function rejectedPinProofs(db: Db, { userId, since }: { userId: string; since: Date }): Promise<number> {
  const [r] = await db
    .select({ n: count() })
    .from(pinProofRejections)
    .where(and(eq(pinProofRejections.userId, userId), gt(pinProofRejections.at, since)));
  return r?.n ?? 0;
}
