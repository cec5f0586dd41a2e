// The tablet's side of sync, independent of HTTP: one round uploads waiting photos
// (./uploads.ts), pushes the outbox in order (./push.ts) and pulls what changed (./pull.ts). The
// transport is injected (./transport.ts), so the same code runs in the browser (./http.ts) and in
// the reliability tests (a lossy in-process server); ./loop.ts decides when a round runs.
import type { RimelogDexie } from "@/lib/local/db";
import { pullAll } from "./pull";
import { foldReceipts, type PushOptions, pushOutbox } from "./push";
import { registerDevice } from "./register";
import type { Transport } from "./transport";
import { uploadAttachments } from "./uploads";

export type SyncOptions = PushOptions & { now?: () => Date };
export type SyncResult = { uploaded: number; accepted: number; rejected: number; pulled: number };

/**
 * One full round: registers the tablet (./register.ts), uploads, pushes until the outbox (of the
 * signed-in user) is empty, pulls. A withdrawn tablet uploads and pushes nothing (its entries
 * stay in the outbox) and still pulls.
 */
export async function syncOnce(db: RimelogDexie, transport: Transport, opts: SyncOptions = {}): Promise<SyncResult> {
  const now = opts.now ?? (() => new Date());
  const startedAt = now().toISOString();
  const result: SyncResult = { uploaded: 0, accepted: 0, rejected: 0, pulled: 0 };
  const registration = await registerDevice(db, transport, now);
  const withdrawn = registration === "withdrawn" || (await db.getMeta("deviceWithdrawn")) != null;
  let session = await db.getMeta("session");
  if (!session) {
    // We do not know who is signed in: a pull tells us (and brings the reference data).
    result.pulled += await pullAll(db, transport, now);
    session = await db.getMeta("session");
  }
  if (session && !withdrawn) {
    result.uploaded += await uploadAttachments(db, transport, session.user.id, now);
    // Answers are written into their entries after the push (and after a failed one, as far as
    // it got), so the server is kept busy while the tablet only records receipts.
    const pushed = await pushOutbox(db, transport, session.user.id, opts, now).finally(() => foldReceipts(db));
    result.accepted += pushed.accepted;
    result.rejected += pushed.rejected;
  }
  result.pulled += await pullAll(db, transport, now);
  // One write for the round's times (each write makes a tap that comes meanwhile wait).
  await db.meta.bulkPut([
    { key: "lastAttempt", value: startedAt },
    { key: "lastSuccess", value: now().toISOString() },
    { key: "lastError", value: null },
  ]);
  return result;
}
