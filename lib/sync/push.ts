// The push: the outbox sent in order of writing, in batches within the server's bounds, each
// batch's body made while the previous one travels; every answer kept as a receipt (with the
// outbox rows it answers removed) at once, and written into its entries after the push.
// The outbox is the truth: a row leaves it only when the server has answered for its entry.
import type { OutboxRow, RimelogDexie, StoredLocalEntry } from "@/lib/local/db";
import { pendingEntry } from "@/lib/local/store";
import type { EntryInput } from "@/lib/schemas/entry";
import type { PushReply } from "./protocol";
import { PUSH_LIMITS } from "./protocol";
import { type Transport, TransportError } from "./transport";

/** Bounds of one push request (never over PUSH_LIMITS). */
export type PushOptions = { maxBatch?: number; maxBytes?: number };

const RECORD_FIELDS = [
  "id",
  "cryostatId",
  "runId",
  "kind",
  "payload",
  "authorId",
  "deviceId",
  "recordedAt",
  "supersedes",
  "reason",
] as const;

/** The entry as its author wrote it (what is pushed), without the tablet's sync bookkeeping. */
export function toInput(e: StoredLocalEntry): EntryInput {
  const out: Record<string, unknown> = {};
  for (const k of RECORD_FIELDS) out[k] = e[k];
  return out as EntryInput;
}

type Batch = { after: number; rows: OutboxRow[]; list: EntryInput[]; encoded?: unknown };

/**
 * The next outbox rows of this author written after outbox number `after` (the order of writing),
 * within the count and byte bounds, with the entries they carry. Rows whose entry is gone are
 * bookkeeping only and are dropped here. Null when nothing is left.
 */
async function nextBatch(
  db: RimelogDexie,
  userId: string,
  after: number,
  maxBatch: number,
  maxBytes: number,
): Promise<Batch | null> {
  for (;;) {
    const read = await db.transaction("r", [db.outbox, db.entries], async () => {
      const rows = await db.outbox
        .where("[authorId+n]")
        .between([userId, after + 1], [userId, Infinity], true, true)
        .limit(maxBatch)
        .toArray();
      let bytes = 0;
      const batchRows = rows.filter((r, i) => {
        bytes += r.bytes + 2;
        return i === 0 || bytes <= maxBytes;
      });
      // Rows queued by an older version of the app carry no entry: read those from the store.
      const older = batchRows.filter((r) => !r.entry);
      const found = older.length ? await db.entries.bulkGet(older.map((r) => r.entryId)) : [];
      const byId = new Map(found.flatMap((e) => (e ? [[e.id, toInput(e)] as const] : [])));
      return { rows: batchRows, list: batchRows.map((r) => r.entry ?? byId.get(r.entryId)) };
    });
    if (read.rows.length === 0) return null;
    const orphans = read.rows.filter((_, i) => !read.list[i]);
    if (orphans.length === 0) return { after, rows: read.rows, list: read.list as EntryInput[] };
    await db.outbox.bulkDelete(orphans.map((r) => r.n!));
  }
}

export type Tally = { accepted: number; rejected: number };

const FIRST_BATCH = 200;

const quiet = <T>(p: Promise<T>): Promise<T> => {
  p.catch(() => undefined); // awaited later; never an unhandled rejection meanwhile
  return p;
};

/**
 * Push the outbox in order of writing. Requests go one after another (the server sees the
 * tablet's order), but the tablet's bookkeeping overlaps them: as soon as an answer arrives the
 * next batch (read while the previous request travelled) is sent, and only then is the answer
 * written into the store. A reload at any point loses nothing: unanswered rows are still in the
 * outbox and are pushed again, and the server answers a repeat the same way.
 */
export async function pushOutbox(
  db: RimelogDexie,
  transport: Transport,
  userId: string,
  opts: PushOptions,
  now: () => Date,
): Promise<Tally> {
  let maxBatch = Math.min(opts.maxBatch ?? 200, PUSH_LIMITS.maxEntries);
  const maxBytes = Math.min(opts.maxBytes ?? 1_000_000, PUSH_LIMITS.maxBytes);
  const total: Tally = { accepted: 0, rejected: 0 };
  let writing: Promise<Tally> | null = null; // the previous answer being written
  const settle = async () => {
    if (!writing) return;
    const w = writing;
    writing = null;
    const answered = await w;
    total.accepted += answered.accepted;
    total.rejected += answered.rejected;
    if (answered.accepted + answered.rejected === 0) {
      throw new TransportError("server", "The server answered for none of the entries sent; they stay queued.");
    }
  };
  // The batch after `after`, with its request body made ahead (while the previous push travels).
  const readAfter = (after: number, limit = maxBatch) =>
    quiet(
      nextBatch(db, userId, after, limit, maxBytes).then((b) =>
        b && transport.encodePush ? { ...b, encoded: transport.encodePush(b.list) } : b,
      ),
    );
  // A small first batch gets the server working sooner; the ones read while it travels are full.
  let next = readAfter(0, Math.min(maxBatch, FIRST_BATCH));
  let batch: Batch | null = null;
  let sending: Promise<PushReply> | null = null;
  // Send `b` and start reading the batch after it.
  const send = (b: Batch) => {
    batch = b;
    sending = quiet(transport.push(b.list, b.encoded));
    next = readAfter(b.rows.at(-1)!.n!);
  };
  try {
    const first = await next;
    if (first) send(first);
    while (batch && sending) {
      const sent: Batch = batch;
      let reply: PushReply;
      try {
        reply = await sending;
      } catch (e) {
        if (!(e instanceof TransportError && e.kind === "too_large")) throw e;
        batch = null;
        if (sent.list.length > 1) {
          // Smaller batches from the same place on.
          maxBatch = Math.max(1, Math.floor(sent.list.length / 2));
          next = readAfter(sent.after);
        } else {
          // A single entry the server will never take: keep it, visibly refused.
          await settle();
          await markRejected(db, [{ id: sent.list[0]!.id, code: "too_large:entry", message: e.message }], now);
          total.rejected += 1;
        }
        const following = await next;
        if (following) send(following);
        continue;
      }
      batch = null;
      const following = await next;
      if (following) send(following); // on its way before this answer is written
      await settle(); // answers are written one at a time, in order
      writing = quiet(applyPushReply(db, reply, sent, now));
    }
    await settle();
  } finally {
    // Whatever went wrong, no write is left running behind the caller's back.
    if (writing) await (writing as Promise<Tally>).catch(() => undefined);
  }
  return total;
}

async function markRejected(
  db: RimelogDexie,
  rejected: { id: string; code: string; message: string }[],
  now: () => Date,
) {
  await db.transaction("rw", [db.entries, db.outbox], async () => {
    for (const r of rejected) {
      await db.entries.update(r.id, {
        sync: "rejected",
        rejection: { code: r.code, message: r.message, at: now().toISOString() },
      });
      await db.outbox.where("entryId").equals(r.id).delete();
    }
  });
}

/**
 * Record a push answer in one transaction. Only entries of the batch sent count; an answered
 * entry leaves the outbox, an unanswered one stays queued. The accepted ones are kept as one
 * receipt row (the server's whole link for each: seq, hash, prevHash, receivedAt), written into
 * the entries by `foldReceipts`; a refused entry is marked at once, from the copy sent, with the
 * server's reason. Both commit together with the outbox removal, so no answer is ever half kept.
 */
export async function applyPushReply(
  db: RimelogDexie,
  reply: PushReply,
  sent: { rows: OutboxRow[]; list: EntryInput[] },
  now: () => Date,
): Promise<Tally> {
  const byId = new Map(sent.list.map((e, i) => [e.id, { entry: e, row: sent.rows[i]! }]));
  const acc = reply.accepted.filter((a) => byId.has(a.id));
  const accIds = new Set(acc.map((a) => a.id));
  const rej = reply.rejected.filter((r) => byId.has(r.id) && !accIds.has(r.id));
  if (acc.length + rej.length === 0) return { accepted: 0, rejected: 0 };
  const at = now().toISOString();
  const refused: StoredLocalEntry[] = rej.map((r) => ({
    ...pendingEntry(byId.get(r.id)!.entry),
    sync: "rejected",
    rejection: { code: r.code, message: r.message, at },
  }));
  await db.transaction("rw", [db.entries, db.outbox, db.receipts], async () => {
    if (acc.length) {
      await db.receipts.add({
        at,
        accepted: acc.map(({ id, seq, hash, prevHash, receivedAt }) => ({ id, seq, hash, prevHash, receivedAt })),
      });
    }
    if (refused.length) await db.entries.bulkPut(refused);
    // By primary key, only this batch's rows: one range when they are consecutive (the usual
    // case; another author's row in between would make them not so), else key by key.
    const ns = [...acc, ...rej].map((a) => byId.get(a.id)!.row.n!).sort((a, b) => a - b);
    const first = ns[0]!;
    const last = ns.at(-1)!;
    if (last - first + 1 === ns.length) await db.outbox.where(":id").between(first, last, true, true).delete();
    else await db.outbox.bulkDelete(ns);
  });
  return { accepted: acc.length, rejected: rej.length };
}

/**
 * Write the receipts into their entries, oldest first, one receipt a transaction (a tap waits
 * for at most one). An entry still pending becomes the server's copy; one already holding it
 * (a pull came first) or gone from the tablet (its author signed out) is left as it is.
 * Returns how many entries were marked synced.
 */
export async function foldReceipts(db: RimelogDexie): Promise<number> {
  let marked = 0;
  for (;;) {
    const done = await db.transaction("rw", [db.entries, db.receipts], async () => {
      const receipt = await db.receipts.orderBy(":id").first();
      if (!receipt) return null;
      const locals = await db.entries.bulkGet(receipt.accepted.map((a) => a.id));
      const put: StoredLocalEntry[] = [];
      receipt.accepted.forEach((a, i) => {
        const local = locals[i];
        if (local && local.seq === null)
          put.push({
            ...local,
            sync: "synced",
            seq: a.seq,
            hash: a.hash,
            prevHash: a.prevHash,
            receivedAt: a.receivedAt,
            rejection: null,
          });
      });
      if (put.length) await db.entries.bulkPut(put);
      await db.receipts.delete(receipt.n!);
      return put.length;
    });
    if (done === null) return marked;
    marked += done;
  }
}
