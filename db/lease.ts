// Work that exactly one app process does (the background tick), when several share a PostgreSQL
// server: the process holding the lease (a session-level advisory lock on a connection of its
// own, db/pg.ts) does it; the others skip it and may nudge the holder. On PGlite there is one
// process, which always holds it.
import type { Db } from "./client";
import { LOCKS } from "./locks";

export type Lease = "tick";

/** Does this process hold the lease (taking it if free)? `onNudge` runs here when another process nudges. */
export async function holdsLease(db: Db, lease: Lease, onNudge?: () => void): Promise<boolean> {
  return db.$client.holdLease ? db.$client.holdLease(LOCKS[lease], onNudge) : true;
}

/** Ask the process holding the lease to run soon (PostgreSQL NOTIFY; nothing to do on PGlite). */
export async function nudgeLease(db: Db, lease: Lease): Promise<void> {
  await db.$client.nudgeLease?.(LOCKS[lease]);
}
