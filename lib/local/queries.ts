// Reads from the tablet store, shared by the live-query hooks and tests: entries (pulled + local,
// newest first), reference data (calibrations in force, series built from the log) and the sync
// summary.
import type { CalibrationRecord } from "@/lib/schemas/calibration";
import type { EntryKind } from "@/lib/schemas/entry";
import { buildSeries, type CryostatSeries, SERIES_KINDS } from "@/lib/series";
import type { RimelogDexie, StoredLocalEntry } from "./db";

/** Which entries to read; `kinds: []` reads none. */
export type EntryFilter = { cryostatId?: string | null; runId?: string; kinds?: EntryKind[]; limit?: number };

/** Unsent and refused entries first (newest first), then the server's order, newest first. */
export function newestFirst(a: StoredLocalEntry, b: StoredLocalEntry): number {
  const ua = a.seq === null;
  const ub = b.seq === null;
  if (ua !== ub) return ua ? -1 : 1;
  if (ua) return b.recordedAt.localeCompare(a.recordedAt);
  return (b.seq ?? 0) - (a.seq ?? 0);
}

/**
 * An entry is unsent while its outbox row exists (the outbox is the truth). Between the server's
 * answer and the moment that answer is written into the entry (a receipt, see foldReceipts in
 * lib/sync/push.ts) the entry itself still says "pending": it is shown as synced from the
 * moment its outbox row is gone, so the rows agree with the pending count.
 */
async function withSendState(db: RimelogDexie, list: StoredLocalEntry[]): Promise<StoredLocalEntry[]> {
  const pending = list.filter((e) => e.sync === "pending");
  if (pending.length === 0) return list;
  // One count per entry, all sent at once: `anyOf` would walk a cursor, one round trip to the
  // browser's storage after another (≈ 0.5 ms each), and a live list asks again on every answer.
  const counts = await db.transaction("r", db.outbox, () =>
    Promise.all(pending.map((e) => db.outbox.where("entryId").equals(e.id).count())),
  );
  const queued = new Set(pending.filter((_, i) => counts[i]! > 0).map((e) => e.id));
  if (queued.size === pending.length) return list;
  return list.map((e) => (e.sync === "pending" && !queued.has(e.id) ? { ...e, sync: "synced" } : e));
}

/** One entry as the screens show it (see withSendState), or null. */
export async function queryEntry(db: RimelogDexie, id: string): Promise<StoredLocalEntry | null> {
  const e = await db.entries.get(id);
  return e ? ((await withSendState(db, [e]))[0] ?? null) : null;
}

export async function queryEntries(db: RimelogDexie, f: EntryFilter = {}): Promise<StoredLocalEntry[]> {
  if (typeof f.cryostatId === "string" && f.limit && !f.runId && !f.kinds)
    return newestOfCryostat(db, f.cryostatId, f.limit);
  let list: StoredLocalEntry[];
  if (f.runId) list = await db.entries.where("runId").equals(f.runId).toArray();
  else if (f.kinds && typeof f.cryostatId === "string") {
    const c = f.cryostatId;
    list = await db.entries
      .where("[cryostatId+kind]")
      .anyOf(f.kinds.map((k) => [c, k]))
      .toArray();
  } else if (f.kinds) list = await db.entries.where("kind").anyOf(f.kinds).toArray();
  else if (typeof f.cryostatId === "string") list = await db.entries.where("cryostatId").equals(f.cryostatId).toArray();
  else list = await db.entries.toArray();
  list = list.filter(
    (e) =>
      (f.cryostatId === undefined || e.cryostatId === f.cryostatId) &&
      (!f.runId || e.runId === f.runId) &&
      (!f.kinds || f.kinds.includes(e.kind)),
  );
  list.sort(newestFirst);
  return withSendState(db, f.limit ? list.slice(0, f.limit) : list);
}

/**
 * A cryostat's newest entries without reading its whole log: the unsent and refused ones (few),
 * then the synced ones from the [cryostatId+seq] index, newest first, up to `limit`.
 */
async function newestOfCryostat(db: RimelogDexie, cryostatId: string, limit: number): Promise<StoredLocalEntry[]> {
  return db.transaction("r", [db.entries, db.outbox], async () =>
    withSendState(db, await newestOfCryostatIn(db, cryostatId, limit)),
  );
}

async function newestOfCryostatIn(db: RimelogDexie, cryostatId: string, limit: number): Promise<StoredLocalEntry[]> {
  const newestWith = (sync: string) =>
    db.entries
      .where("[cryostatId+sync+recordedAt]")
      .between([cryostatId, sync, ""], [cryostatId, sync, "\uffff"])
      .reverse()
      .limit(limit)
      .toArray();
  const unsent = [...(await newestWith("pending")), ...(await newestWith("rejected"))];
  const synced = await db.entries
    .where("[cryostatId+seq]")
    .between([cryostatId, -Infinity], [cryostatId, Infinity])
    .reverse()
    .limit(limit)
    .toArray();
  return [...unsent, ...synced].sort(newestFirst).slice(0, limit);
}

export type SyncSummary = {
  pending: number;
  rejected: StoredLocalEntry[];
  pendingAttachments: number;
  rejectedAttachments: { id: string; fileName: string; message: string }[];
  lastSuccess: string | null;
  lastAttempt: string | null;
  lastError: { code: string; message: string; at: string } | null;
  user: { id: string; name: string; role: string } | null;
  sessionConfirmedAt: string | null;
  deviceId: string | null;
  /** The server's word that this tablet was withdrawn (nothing more is pushed), or null. */
  withdrawn: { message: string; at: string } | null;
};

export async function syncSummary(db: RimelogDexie): Promise<SyncSummary> {
  // One read transaction, not nine: a tap's write waits for every read already running.
  const [
    pending,
    rejected,
    pendingAttachments,
    rejectedAtt,
    [lastSuccess, lastAttempt, lastError, session, deviceId, withdrawn],
  ] = await db.transaction("r", [db.outbox, db.entries, db.attachments, db.meta], () =>
    Promise.all([
      db.outbox.count(),
      db.entries.where("sync").equals("rejected").toArray(),
      db.attachments.where("state").equals("pending").count(),
      db.attachments.where("state").equals("rejected").toArray(),
      db.getMetas("lastSuccess", "lastAttempt", "lastError", "session", "deviceId", "deviceWithdrawn"),
    ]),
  );
  return {
    pending,
    rejected: rejected.sort(newestFirst),
    pendingAttachments,
    rejectedAttachments: rejectedAtt.map((a) => ({
      id: a.id,
      fileName: a.fileName,
      message: a.rejection?.message ?? "refused",
    })),
    lastSuccess: lastSuccess ?? null,
    lastAttempt: lastAttempt ?? null,
    lastError: lastError ?? null,
    user: session ? { id: session.user.id, name: session.user.name, role: session.user.role } : null,
    sessionConfirmedAt: session?.confirmedAt ?? null,
    deviceId: deviceId ?? null,
    withdrawn: withdrawn ?? null,
  };
}

/** The sensor calibration tables in force for a cryostat as last pulled, newest first. */
export async function calibrationsOf(db: RimelogDexie, cryostatId: string): Promise<CalibrationRecord[]> {
  const rows = await db.calibrations.where("cryostatId").equals(cryostatId).toArray();
  return rows.sort((a, b) => b.acceptedAt.localeCompare(a.acceptedAt) || b.id.localeCompare(a.id));
}

export type SeriesKind = (typeof SERIES_KINDS)[number];

/**
 * A cryostat's chart series from its log on the tablet, built as the server builds it
 * (lib/series.ts), with the unsent entries and without the refused ones; only entries of `kinds`
 * are read. Null when the cryostat is not on the tablet.
 */
export async function seriesOf(
  db: RimelogDexie,
  cryostatId: string,
  kinds: readonly SeriesKind[] = SERIES_KINDS,
  now = Date.now(),
): Promise<CryostatSeries | null> {
  return db.transaction("r", [db.cryostats, db.entries], async () => {
    const cryostat = await db.cryostats.get(cryostatId);
    if (!cryostat) return null;
    const rows = await db.entries
      .where("[cryostatId+kind]")
      .anyOf(kinds.map((k) => [cryostatId, k]))
      .toArray();
    return buildSeries(
      cryostat,
      rows.filter((e) => e.sync !== "rejected"),
      now,
    );
  });
}
