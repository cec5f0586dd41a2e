// The tablet's side of sync, independent of HTTP: upload waiting photos, push the outbox in
// order, apply the server's answer, pull what changed. The transport is injected, so the same
// code runs in the browser (fetch) and in the reliability tests (a lossy in-process server).
// The outbox is the truth: a row leaves it only when the server has answered for its entry (S3).
import type { SessionUser } from "@/lib/auth/session-user";
import type { EntryInput, StoredEntry } from "@/lib/schemas/entry";
import type { RimelogDexie, StoredLocalEntry } from "@/lib/local/db";
import { recordHash } from "./hash";
import type { PullReply, PushReply, UploadReply } from "./protocol";
import { PUSH_LIMITS } from "./protocol";

export type TransportErrorKind = "offline" | "unauthorized" | "too_large" | "bad_request" | "forbidden" | "server";

export class TransportError extends Error {
  constructor(
    public readonly kind: TransportErrorKind,
    message: string,
    public readonly status?: number,
    public readonly code?: string,
  ) {
    super(message);
    this.name = "TransportError";
  }
}

export interface Transport {
  push(entries: EntryInput[]): Promise<PushReply>;
  pull(since: number, refHash: string | null): Promise<PullReply>;
  upload?(a: { id: string; blob: Blob; fileName: string; mime: string }): Promise<UploadReply>;
}

export type SyncOptions = { maxBatch?: number; maxBytes?: number; now?: () => Date };
export type SyncResult = { uploaded: number; accepted: number; rejected: number; pulled: number };

const RECORD_FIELDS = ["id", "cryostatId", "runId", "kind", "payload", "authorId", "deviceId", "recordedAt", "supersedes", "reason"] as const;

/** The entry as its author wrote it (what is pushed), without the tablet's sync bookkeeping. */
export function toInput(e: StoredLocalEntry): EntryInput {
  const out: Record<string, unknown> = {};
  for (const k of RECORD_FIELDS) out[k] = e[k];
  return out as EntryInput;
}

function synced(e: StoredEntry): StoredLocalEntry {
  const { chain: _chain, ...rest } = e;
  return { ...rest, sync: "synced", rejection: null };
}

/** One full round: uploads, pushes until the outbox (of the signed-in user) is empty, pulls. */
export async function syncOnce(db: RimelogDexie, transport: Transport, opts: SyncOptions = {}): Promise<SyncResult> {
  const now = opts.now ?? (() => new Date());
  await db.setMeta("lastAttempt", now().toISOString());
  const result: SyncResult = { uploaded: 0, accepted: 0, rejected: 0, pulled: 0 };
  let session = await db.getMeta("session");
  if (!session) {
    // We do not know who is signed in: a pull tells us (and brings the reference data).
    result.pulled += await pullAll(db, transport, now);
    session = await db.getMeta("session");
  }
  if (session) {
    result.uploaded += await uploadAttachments(db, transport, session.user.id, now);
    const pushed = await pushOutbox(db, transport, session.user.id, opts, now);
    result.accepted += pushed.accepted;
    result.rejected += pushed.rejected;
  }
  result.pulled += await pullAll(db, transport, now);
  await db.transaction("rw", db.meta, async () => {
    await db.setMeta("lastSuccess", now().toISOString());
    await db.setMeta("lastError", null);
  });
  return result;
}

async function uploadAttachments(db: RimelogDexie, transport: Transport, userId: string, now: () => Date): Promise<number> {
  if (!transport.upload) return 0;
  const waiting = (await db.attachments.where("state").equals("pending").toArray()).filter((a) => a.authorId === userId);
  let n = 0;
  for (const a of waiting) {
    try {
      await transport.upload(a);
      await db.attachments.update(a.id, { state: "uploaded", rejection: null });
      n += 1;
    } catch (e) {
      // A file the server refuses (type, size) is marked and kept; anything else stops this round.
      if (e instanceof TransportError && (e.kind === "bad_request" || e.kind === "too_large" || e.kind === "forbidden")) {
        await db.attachments.update(a.id, { state: "rejected", rejection: { code: e.code ?? e.kind, message: e.message, at: now().toISOString() } });
      } else throw e;
    }
  }
  return n;
}

async function pushOutbox(db: RimelogDexie, transport: Transport, userId: string, opts: SyncOptions, now: () => Date) {
  let maxBatch = Math.min(opts.maxBatch ?? 200, PUSH_LIMITS.maxEntries);
  const maxBytes = Math.min(opts.maxBytes ?? 1_000_000, PUSH_LIMITS.maxBytes);
  const total = { accepted: 0, rejected: 0 };
  for (;;) {
    // Index order on authorId, then by primary key n: the order of writing on this tablet.
    const rows = await db.outbox.where("authorId").equals(userId).limit(maxBatch).toArray();
    if (rows.length === 0) return total;
    let bytes = 0;
    const batchRows = rows.filter((r, i) => {
      bytes += r.bytes + 2;
      return i === 0 || bytes <= maxBytes;
    });
    const found = await db.entries.bulkGet(batchRows.map((r) => r.entryId));
    const orphans = batchRows.filter((_, i) => !found[i]);
    if (orphans.length) {
      // An outbox row without its entry cannot be sent; it is bookkeeping only.
      await db.outbox.bulkDelete(orphans.map((r) => r.n!));
      continue;
    }
    const list = found as StoredLocalEntry[];
    let reply: PushReply;
    try {
      reply = await transport.push(list.map(toInput));
    } catch (e) {
      if (e instanceof TransportError && e.kind === "too_large") {
        if (list.length > 1) {
          maxBatch = Math.max(1, Math.floor(list.length / 2));
          continue;
        }
        // A single entry the server will never take: keep it, visibly refused.
        await markRejected(db, [{ id: list[0]!.id, code: "too_large:entry", message: e.message }], now);
        total.rejected += 1;
        continue;
      }
      throw e;
    }
    const answered = await applyPushReply(db, reply, new Set(list.map((e) => e.id)), now);
    total.accepted += answered.accepted;
    total.rejected += answered.rejected;
    if (answered.accepted + answered.rejected === 0) {
      throw new TransportError("server", "The server answered for none of the entries sent; they stay queued.");
    }
  }
}

async function markRejected(db: RimelogDexie, rejected: { id: string; code: string; message: string }[], now: () => Date) {
  await db.transaction("rw", [db.entries, db.outbox], async () => {
    for (const r of rejected) {
      await db.entries.update(r.id, { sync: "rejected", rejection: { code: r.code, message: r.message, at: now().toISOString() } });
      await db.outbox.where("entryId").equals(r.id).delete();
    }
  });
}

/** Apply a push answer in one transaction; only ids that were in the batch are touched. */
export async function applyPushReply(db: RimelogDexie, reply: PushReply, sent: Set<string>, now: () => Date) {
  const acc = reply.accepted.filter((a) => sent.has(a.id));
  const accIds = new Set(acc.map((a) => a.id));
  const rej = reply.rejected.filter((r) => sent.has(r.id) && !accIds.has(r.id));
  const at = now().toISOString();
  await db.transaction("rw", [db.entries, db.outbox], async () => {
    const ids = [...acc.map((a) => a.id), ...rej.map((r) => r.id)];
    const locals = await db.entries.bulkGet(ids);
    const updated: StoredLocalEntry[] = [];
    acc.forEach((a, i) => {
      const local = locals[i];
      // A pull may already have brought the full server copy; keep its prevHash/receivedAt.
      if (local && local.seq === null) updated.push({ ...local, sync: "synced", seq: a.seq, hash: a.hash, rejection: null });
    });
    rej.forEach((r, j) => {
      const local = locals[acc.length + j];
      if (local && local.seq === null) updated.push({ ...local, sync: "rejected", rejection: { code: r.code, message: r.message, at } });
    });
    if (updated.length) await db.entries.bulkPut(updated);
    if (ids.length) await db.outbox.where("entryId").anyOf(ids).delete();
  });
  return { accepted: acc.length, rejected: rej.length };
}

async function pullAll(db: RimelogDexie, transport: Transport, now: () => Date): Promise<number> {
  let cursor = (await db.getMeta("cursor")) ?? 0;
  let refHash: string | null = (await db.getMeta("refHash")) ?? "none";
  let n = 0;
  for (;;) {
    const reply = await transport.pull(cursor, refHash);
    refHash = null; // reference data is asked for on the first page only
    const applied = await applyPull(db, reply, now);
    if (applied.restart) {
      // Someone else is signed in now: start their view from the beginning.
      cursor = 0;
      refHash = "none";
      continue;
    }
    cursor = applied.cursor;
    n += reply.entries.length;
    if (!reply.hasMore) return n;
  }
}

/**
 * Apply one pull page in one transaction; returns the cursor, which never decreases while the
 * same person is signed in (S5). A page for a different person than the tablet knew is not
 * applied: the previous view is forgotten and the pull restarts from zero.
 */
export async function applyPull(db: RimelogDexie, reply: PullReply, now: () => Date): Promise<{ cursor: number; restart: boolean }> {
  return db.transaction("rw", [db.entries, db.outbox, db.meta, db.cryostats, db.templates, db.users, db.attachments], async () => {
    const session = await db.getMeta("session");
    await db.setMeta("session", { user: reply.me, confirmedAt: now().toISOString() });
    if (session && session.user.id !== reply.me.id) {
      await forgetPulledData(db);
      return { cursor: 0, restart: true };
    }

    const ids = reply.entries.map((e) => e.id);
    const locals = await db.entries.bulkGet(ids);
    const put: StoredLocalEntry[] = [];
    const acknowledged: string[] = [];
    reply.entries.forEach((e, i) => {
      const local = locals[i];
      if (local && local.seq === null) {
        // Our own entry came back from the server: it is stored there, so it leaves the outbox.
        // Same id with other content would be a conflict: keep ours; its push gets the answer.
        if (recordHash(local) !== recordHash(e)) return;
        acknowledged.push(e.id);
      }
      put.push(synced(e));
    });
    if (put.length) await db.entries.bulkPut(put);
    if (acknowledged.length) await db.outbox.where("entryId").anyOf(acknowledged).delete();

    const before = (await db.getMeta("cursor")) ?? 0;
    const cursor = Math.max(before, reply.cursor);
    await db.setMeta("cursor", cursor);

    const ref = reply.reference;
    if (ref) {
      await db.cryostats.clear();
      await db.cryostats.bulkPut(ref.cryostats);
      await db.templates.clear();
      await db.templates.bulkPut(ref.templates);
      await db.users.clear();
      await db.users.bulkPut(ref.users);
      await db.setMeta("rules", ref.rules);
      await db.setMeta("refHash", ref.hash);
    }
    return { cursor, restart: false };
  });
}

/**
 * Another person's session on this tablet: what was pulled for the previous user (their role's
 * view) goes; unsent and refused entries stay (they wait for their author's next sign-in).
 */
async function forgetPulledData(db: RimelogDexie): Promise<void> {
  await db.entries.where("sync").equals("synced").delete();
  await db.cryostats.clear();
  await db.templates.clear();
  await db.users.clear();
  await db.meta.bulkDelete(["cursor", "refHash", "rules", "lastSuccess"]);
}

/** Who the tablet last heard was signed in (for sign-out and the indicator). */
export async function sessionUser(db: RimelogDexie): Promise<SessionUser | null> {
  return (await db.getMeta("session"))?.user ?? null;
}
