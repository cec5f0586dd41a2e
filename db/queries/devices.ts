// Registered tablets: the standing of the devices a push names, creating and binding a
// registration, the last-seen mark of a push, the admin's list and the withdrawal. The decisions
// (who may register, which entry a device may carry) are made by the callers
// (server/devices/register.ts, lib/schemas/device.ts); these are the rows.
import { and, asc, eq, inArray, sql } from "drizzle-orm";
import type { Db } from "@/db/client";
import { type Device, devices, deviceUsers, users } from "@/db/schema";
import type { DeviceStanding, DeviceView } from "@/lib/schemas/device";

/** The standing (withdrawn or not, who signed in) of each known device among `ids`. */
export async function deviceStandings(db: Db, ids: readonly string[]): Promise<Map<string, DeviceStanding>> {
  const out = new Map<string, DeviceStanding>();
  if (ids.length === 0) return out;
  const rows = await db
    .select({ id: devices.id, revokedAt: devices.revokedAt, userId: deviceUsers.userId })
    .from(devices)
    .leftJoin(deviceUsers, eq(deviceUsers.deviceId, devices.id))
    .where(inArray(devices.id, [...ids]));
  for (const r of rows) {
    const d = out.get(r.id) ?? { revokedAt: r.revokedAt, userIds: new Set<string>() };
    if (r.userId) (d.userIds as Set<string>).add(r.userId);
    out.set(r.id, d);
  }
  return out;
}

export async function getDevice(db: Db, id: string): Promise<Device | undefined> {
  const [d] = await db.select().from(devices).where(eq(devices.id, id));
  return d;
}

/** A new registration, with its first user bound. */
export async function createDevice(
  db: Db,
  d: { id: string; secretHash: string; userId: string; pending?: number },
): Promise<void> {
  const now = new Date();
  await db.transaction(async (tx) => {
    await tx.insert(devices).values({
      id: d.id,
      userId: d.userId,
      secretHash: d.secretHash,
      firstSeenAt: now,
      lastSeenAt: now,
      ...pendingSet(d.pending, now),
    });
    await tx
      .insert(deviceUsers)
      .values({ deviceId: d.id, userId: d.userId, firstSignedInAt: now, lastSignedInAt: now });
  });
}

function pendingSet(pending: number | undefined, now: Date) {
  return pending === undefined ? {} : { pendingCount: pending, pendingAt: now };
}

/**
 * Bind `userId` to a device (first or again), mark it seen, and keep its pending count. With
 * `adoptSecretHash`, a device id from before registration gets its secret, only if it has none yet.
 * False when the adoption lost to another one.
 */
export async function bindDeviceUser(
  db: Db,
  d: { id: string; userId: string; pending?: number; adoptSecretHash?: string },
): Promise<boolean> {
  const now = new Date();
  return db.transaction(async (tx) => {
    const set = { lastSeenAt: now, ...pendingSet(d.pending, now) };
    const updated = await tx
      .update(devices)
      .set(d.adoptSecretHash ? { ...set, secretHash: d.adoptSecretHash } : set)
      .where(d.adoptSecretHash ? and(eq(devices.id, d.id), sql`${devices.secretHash} is null`) : eq(devices.id, d.id))
      .returning({ id: devices.id });
    if (updated.length === 0) return false;
    await tx
      .insert(deviceUsers)
      .values({ deviceId: d.id, userId: d.userId, firstSignedInAt: now, lastSignedInAt: now })
      .onConflictDoUpdate({ target: [deviceUsers.deviceId, deviceUsers.userId], set: { lastSignedInAt: now } });
    return true;
  });
}

/** A push from these devices was stored: they were seen now. */
export async function markDevicesSeen(db: Db, ids: readonly string[], at = new Date()): Promise<void> {
  if (ids.length)
    await db
      .update(devices)
      .set({ lastSeenAt: at })
      .where(inArray(devices.id, [...ids]));
}

/** Every device, most recently seen first, with the people who signed in on it. */
export async function listDevices(db: Db): Promise<DeviceView[]> {
  const rows = await db.select().from(devices).orderBy(sql`${devices.lastSeenAt} desc`, asc(devices.id));
  const bound = await db
    .select({
      deviceId: deviceUsers.deviceId,
      id: users.id,
      name: users.name,
      lastSignedInAt: deviceUsers.lastSignedInAt,
    })
    .from(deviceUsers)
    .innerJoin(users, eq(users.id, deviceUsers.userId))
    .orderBy(sql`${deviceUsers.lastSignedInAt} desc`);
  const names = new Map((await db.select({ id: users.id, name: users.name }).from(users)).map((u) => [u.id, u.name]));
  return rows.map((d) => ({
    id: d.id,
    firstSeenAt: d.firstSeenAt.toISOString(),
    lastSeenAt: d.lastSeenAt.toISOString(),
    pendingCount: d.pendingCount,
    pendingAt: d.pendingAt?.toISOString() ?? null,
    registered: d.secretHash !== null,
    users: bound
      .filter((b) => b.deviceId === d.id)
      .map((b) => ({ id: b.id, name: b.name, lastSignedInAt: b.lastSignedInAt.toISOString() })),
    revoked: d.revokedAt
      ? {
          at: d.revokedAt.toISOString(),
          by: d.revokedBy,
          byName: d.revokedBy ? (names.get(d.revokedBy) ?? null) : null,
          reason: d.revokedReason,
        }
      : null,
  }));
}

/**
 * Withdraw a device: who, when and why are kept in its row (there is no entry kind for
 * devices). "not_found" for an unknown id, "already" when it was withdrawn before.
 */
export async function revokeDevice(
  db: Db,
  d: { id: string; by: string; reason: string },
): Promise<"ok" | "not_found" | "already"> {
  const [updated] = await db
    .update(devices)
    .set({ revokedAt: new Date(), revokedBy: d.by, revokedReason: d.reason })
    .where(and(eq(devices.id, d.id), sql`${devices.revokedAt} is null`))
    .returning({ id: devices.id });
  if (updated) return "ok";
  return (await getDevice(db, d.id)) ? "already" : "not_found";
}

/** A registration made directly (the demo seed and tests): the device and the users bound to it. */
export async function insertDevice(
  db: Db,
  d: { id: string; secretHash: string; userIds: readonly [string, ...string[]]; at?: Date },
): Promise<void> {
  const at = d.at ?? new Date();
  await db
    .insert(devices)
    .values({ id: d.id, userId: d.userIds[0], secretHash: d.secretHash, firstSeenAt: at, lastSeenAt: at });
  await db
    .insert(deviceUsers)
    .values(d.userIds.map((userId) => ({ deviceId: d.id, userId, firstSignedInAt: at, lastSignedInAt: at })));
}
