// Shared test fixture: one migrated (and optionally seeded) in-memory PGlite per test worker,
// and a fresh copy of it for each test (dumpDataDir/loadDataDir is much faster than initdb).
import { type Db, openDb } from "@/db/client";
import { seedIfEmpty } from "@/db/seed";

let emptyDump: Promise<File | Blob> | undefined;
let seededDump: Promise<File | Blob> | undefined;

async function dumpOf(seed: boolean): Promise<File | Blob> {
  const db = await openDb();
  if (seed) await seedIfEmpty(db, Date.parse("2026-11-30T12:00:00Z"));
  const dump = await db.$client.dumpDataDir("none");
  await db.$client.close();
  return dump;
}

/** The worker's one dump of each kind, made on first use. */
function dumpFor(seeded: boolean): Promise<File | Blob> {
  if (seeded) {
    seededDump ??= dumpOf(true);
    return seededDump;
  }
  emptyDump ??= dumpOf(false);
  return emptyDump;
}

/** A fresh migrated database; `seeded` adds the demo lab (fixed clock: 2026-11-30 12:00 UTC). */
export async function freshDb({ seeded = false } = {}): Promise<Db> {
  return openDb(undefined, await dumpFor(seeded));
}

export const DEMO_NOW = Date.parse("2026-11-30T12:00:00Z");
