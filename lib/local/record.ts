// The public API other screens use to record on the tablet (procedures, safety forms, maths UI,
// quick entries). Each call writes to the tablet store first and resolves only after the local
// transaction has committed; the sync loop sends it later. See lib/local/README.md.
import type { EntryKind } from "@/lib/schemas/entry";
import { localDb, type StoredLocalEntry } from "./db";
import {
  type EntryDraft,
  putAttachmentIn,
  type RecordedOf,
  recordDrafts,
  recordEntriesIn,
  recordSignedIn,
} from "./store";

export type { Rejection, StoredLocalEntry, SyncState } from "./db";
export type { DraftOf, EntryDraft, LocalWriteCode, RecordedOf } from "./store";
export { LocalWriteError, MAX_ATTACHMENT_BYTES, OFFLINE_SESSION_MS } from "./store";

/**
 * Record one entry: fills id, author (the signed-in user), device and recordedAt, validates it
 * with the shared schema, and writes the entry and its outbox row in one transaction.
 * Throws LocalWriteError (code + a message for the screen) when nothing was saved.
 */
export async function recordEntry<K extends EntryKind>(draft: EntryDraft<K>): Promise<StoredLocalEntry<K>> {
  const [stored] = await recordDrafts(localDb(), [draft] as const);
  if (!stored) throw new Error("recordEntry: nothing was stored");
  return stored;
}

/** Record several entries atomically (all or none), in the given order; each comes back typed by its kind. */
export async function recordEntries<const D extends readonly EntryDraft[]>(drafts: D): Promise<RecordedOf<D>> {
  return recordEntriesIn(localDb(), drafts);
}

/**
 * Record entries and their writer's signature on each, atomically (see recordSignedIn in
 * store.ts): a run's completion (with the transfer record it makes), a correction of someone
 * else's record. Each entry comes back typed by its kind.
 */
export async function recordSigned<const D extends readonly EntryDraft[]>(
  drafts: D,
  sign: (entry: StoredLocalEntry) => Promise<EntryDraft<"signature">>,
): Promise<RecordedOf<D>> {
  return recordSignedIn(localDb(), drafts, sign);
}

/**
 * Keep a photo or file on the tablet; returns its id to put in an entry's payload. It is uploaded
 * on the next sync, before the entries that refer to it.
 */
export async function putAttachment(blob: Blob, meta: { fileName: string; mime: string }): Promise<string> {
  return putAttachmentIn(localDb(), blob, meta);
}
