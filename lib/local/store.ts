// Writing on the tablet: an entry and its outbox row in one Dexie transaction (and a photo blob),
// with the offline session and the registered device id the entry is stamped with. Every function takes the
// Dexie instance first so tests can run several simulated tablets side by side.

import { mayWrite } from "@/lib/auth/permissions";
import { textRefusal } from "@/lib/record/rules";
import { type EntryInput, type EntryKind, type PayloadInput, parseEntry } from "@/lib/schemas/entry";
import type { SessionUser } from "@/lib/schemas/user";
import { canonicalJson } from "@/lib/sync/hash";
import type { LocalSession, OutboxRow, RimelogDexie, StoredLocalEntry } from "./db";
import { emitLocalWrite } from "./events";

/**
 * How long a tablet keeps working after its last contact with the server that confirmed the
 * session. Matches the server session's lifetime (server/auth/options.ts SESSION_MAX_AGE_S = 14 h):
 * after it, new entries are refused until the technician signs in again online. Entries already
 * written stay in the outbox and are sent after that sign-in.
 */
export const OFFLINE_SESSION_MS = 14 * 60 * 60 * 1000;

/** Largest photo or file kept on the tablet for upload (the server enforces its own bound too). */
export const MAX_ATTACHMENT_BYTES = 15 * 1024 * 1024;

/** A draft of one kind, its payload in the form that kind's schema takes (z.input: before defaults). */
export type DraftOf<K extends EntryKind> = {
  cryostatId: string | null;
  runId?: string | null;
  kind: K;
  payload: PayloadInput<K>;
  supersedes?: string | null;
  reason?: string | null;
};
/**
 * What a form hands over: the fields the user chose. Id, author, device and time are filled in.
 * A union over kinds (so `kind` decides what `payload` must be), or of the given kind(s).
 */
export type EntryDraft<K extends EntryKind = EntryKind> = { [P in K]: DraftOf<P> }[K];
/** Any draft, as the write path handles it: the payload is checked by parseEntry, not by type. */
type AnyDraft = Omit<DraftOf<EntryKind>, "payload"> & { payload: unknown };
/** The entries a list of drafts becomes, each of its draft's kind. */
export type RecordedOf<D extends readonly AnyDraft[]> = { [I in keyof D]: StoredLocalEntry<D[I]["kind"]> };

export type LocalWriteCode =
  | "invalid"
  | "forbidden"
  | "no_session"
  | "session_expired"
  | "no_device"
  | "storage_full"
  | "storage_failed";

/** A local write that did not happen. The message is meant for the screen as it is. */
export class LocalWriteError extends Error {
  constructor(
    public readonly code: LocalWriteCode,
    message: string,
    public readonly problems: string[] = [],
  ) {
    super(message);
    this.name = "LocalWriteError";
  }
}

/** Remember who is signed in, as the server just confirmed it (called after each good contact). */
export async function confirmSession(db: RimelogDexie, user: SessionUser, at = new Date()): Promise<void> {
  await db.setMeta("session", { user, confirmedAt: at.toISOString() });
}

export function sessionProblem(session: LocalSession | undefined, now = Date.now()): LocalWriteError | null {
  if (!session)
    return new LocalWriteError("no_session", "Nobody is signed in on this tablet. Connect to the network and sign in.");
  if (now - Date.parse(session.confirmedAt) > OFFLINE_SESSION_MS) {
    return new LocalWriteError(
      "session_expired",
      `You have been offline for more than ${OFFLINE_SESSION_MS / 3_600_000} hours, so this tablet no longer records in your name. Connect to the network and sign in again; nothing already saved is lost.`,
    );
  }
  return null;
}

function toLocalWriteError(e: unknown): LocalWriteError {
  if (e instanceof LocalWriteError) return e;
  const err = e as { name?: string; inner?: { name?: string }; message?: string };
  const names = [err?.name, err?.inner?.name];
  if (names.includes("QuotaExceededError")) {
    return new LocalWriteError(
      "storage_full",
      "The tablet's storage is full: this entry was NOT saved. Connect to the network so synced entries and photos can be cleared, or free space on the tablet, then record it again.",
    );
  }
  return new LocalWriteError(
    "storage_failed",
    `The tablet could not save this entry (${err?.message ?? String(e)}). It was NOT saved: write it down on paper and record it again when the tablet works (private browsing mode cannot store entries).`,
  );
}

/** Build and validate one entry from a draft; throws LocalWriteError("invalid") with the problems. */
export function buildEntry(draft: AnyDraft, authorId: string, deviceId: string, now = new Date()): EntryInput {
  const parsed = parseEntry({
    id: crypto.randomUUID(),
    cryostatId: draft.cryostatId,
    runId: draft.runId ?? null,
    kind: draft.kind,
    payload: draft.payload,
    authorId,
    deviceId,
    recordedAt: now.toISOString(),
    supersedes: draft.supersedes ?? null,
    reason: draft.reason ?? null,
  });
  if (!parsed.ok)
    throw new LocalWriteError(
      "invalid",
      `This ${draft.kind} entry is not complete: ${parsed.problems.join("; ")}`,
      parsed.problems,
    );
  // The server refuses text it cannot store; say so before the entry is saved, not after the push.
  const text = textRefusal(parsed.entry);
  if (text) throw new LocalWriteError("invalid", text.message, [text.message]);
  return parsed.entry;
}

export function pendingEntry(e: EntryInput): StoredLocalEntry {
  return { ...e, sync: "pending", seq: null, hash: null, prevHash: null, receivedAt: null, rejection: null };
}

/** Who the last write on a store was made for (user and device), as read inside its transaction. */
type Signer = { user: SessionUser; deviceId: string };
const lastSigner = new WeakMap<RimelogDexie, Signer>();

/** The signature, role check, validation and rows of one write, made before its transaction. */
function prepare(
  drafts: readonly AnyDraft[],
  signer: Signer,
  now: Date,
): { stored: StoredLocalEntry[]; rows: OutboxRow[] } {
  for (const d of drafts) {
    if (!mayWrite(signer.user.role, d.kind)) {
      throw new LocalWriteError(
        "forbidden",
        `A ${signer.user.role.replace("_", " ")} may not record entries of kind "${d.kind}".`,
      );
    }
  }
  // Built (and so validated) before anything is written: an invalid draft writes nothing.
  return ready(
    drafts.map((d) => buildEntry(d, signer.user.id, signer.deviceId, now)),
    now,
  );
}

/** The stored rows and outbox rows of entries already built. */
function ready(built: EntryInput[], now: Date): { stored: StoredLocalEntry[]; rows: OutboxRow[] } {
  const rows = built.map((e) => ({
    entryId: e.id,
    authorId: e.authorId,
    queuedAt: now.toISOString(),
    bytes: canonicalJson(e).length,
    entry: e,
  }));
  return { stored: built.map(pendingEntry), rows };
}

/** The write was prepared for someone who is no longer the signed-in user on this tablet. */
class StaleSigner extends Error {}

/**
 * Write entries prepared for `signer`, sending the writes together with the read of who is
 * signed in now. False (and nothing written: the transaction is aborted) when the store names
 * another person or device, or the session has run out.
 */
async function writePrepared(
  db: RimelogDexie,
  signer: Signer,
  ready: ReturnType<typeof prepare>,
  now: Date,
): Promise<boolean> {
  try {
    await db.transaction("rw", [db.entries, db.outbox, db.meta], async () => {
      const writes: Promise<unknown>[] = [db.entries.bulkAdd(ready.stored), db.outbox.bulkAdd(ready.rows)];
      for (const w of writes) w.catch(() => undefined); // awaited below, or undone by the abort
      const [session, deviceId] = await db.getMetas("session", "deviceId");
      if (
        !session ||
        sessionProblem(session, now.getTime()) ||
        deviceId !== signer.deviceId ||
        session.user.id !== signer.user.id ||
        session.user.role !== signer.user.role
      ) {
        throw new StaleSigner(); // aborts the transaction: the writes above are undone
      }
      await Promise.all(writes);
    });
    return true;
  } catch (e) {
    if (e instanceof StaleSigner) return false;
    throw e;
  }
}

/**
 * The tablet has no registration yet. It registers at the online sign-in (and at each sync
 * round), before the first session is confirmed, so this should not happen; if it does, nothing
 * is written under an id the server never issued (the server would refuse it for good).
 */
const NO_DEVICE = () =>
  new LocalWriteError(
    "no_device",
    "This tablet is not registered with the server yet, so it cannot record. Connect to the network and sign in again; this entry was NOT saved.",
  );

/** Read who is signed in and the tablet's registered id, then write for them. */
async function writeAfterReading(
  db: RimelogDexie,
  drafts: readonly AnyDraft[],
  now: Date,
): Promise<StoredLocalEntry[]> {
  return db.transaction("rw", [db.entries, db.outbox, db.meta], async () => {
    const [session, deviceId] = await db.getMetas("session", "deviceId");
    const problem = sessionProblem(session, now.getTime()) ?? (deviceId ? null : NO_DEVICE());
    if (problem || !session || !deviceId) throw problem;
    const signer = { user: session.user, deviceId };
    const fresh = prepare(drafts, signer, now);
    await Promise.all([db.entries.bulkAdd(fresh.stored), db.outbox.bulkAdd(fresh.rows)]);
    lastSigner.set(db, signer);
    return fresh.stored;
  });
}

/**
 * Record several entries atomically: all of them with their outbox rows in one transaction, or
 * none. Resolves only after the transaction has committed (strict durability).
 *
 * A tap is on the clock, so the transaction does no work between its requests: the entries are
 * prepared beforehand for the person the previous write on this store was made for, and the
 * writes go out together with the read of who is signed in now. If that read shows someone else
 * (or another device id, or an expired session), nothing is written and the write is made again
 * for the person the store names. The first write on a store reads first, then writes.
 */
export async function recordEntriesIn<const D extends readonly EntryDraft[]>(
  db: RimelogDexie,
  drafts: D,
  now = new Date(),
): Promise<RecordedOf<D>> {
  return recordDrafts(db, drafts, now);
}

/** recordEntriesIn for drafts already typed elsewhere (recordEntry's one draft of kind K). */
export async function recordDrafts<const D extends readonly AnyDraft[]>(
  db: RimelogDexie,
  drafts: D,
  now = new Date(),
): Promise<RecordedOf<D>> {
  // One stored entry per draft, in the drafts' order, each built from its draft (same kind).
  return (await recordList(db, drafts, now)) as RecordedOf<D>;
}

async function recordList(db: RimelogDexie, drafts: readonly AnyDraft[], now: Date): Promise<StoredLocalEntry[]> {
  if (drafts.length === 0) return [];
  let stored: StoredLocalEntry[];
  try {
    const hint = lastSigner.get(db);
    let ready: ReturnType<typeof prepare> | null = null;
    try {
      ready = hint ? prepare(drafts, hint, now) : null;
    } catch {
      // Refused for the person of the hint: made (and refused or not) for the person signed in.
    }
    if (hint && ready && (await writePrepared(db, hint, ready, now))) stored = ready.stored;
    else {
      lastSigner.delete(db);
      stored = await writeAfterReading(db, drafts, now);
    }
  } catch (e) {
    throw toLocalWriteError(e);
  }
  emitLocalWrite();
  return stored;
}

/**
 * Record entries together with their writer's signature on each, in one transaction: all or
 * none, so they reach the server in the same push (the server refuses a run's completion, or a
 * correction of someone else's record, that arrives without its signature). `sign` is handed
 * each entry exactly as it will be stored (its hash is what the signature binds) and returns the
 * signature's draft; it may be slow (a PIN check, a password proof from the server), so it runs
 * before the write, and the write is refused if someone else signed in meanwhile. The entries
 * are stored in the drafts' order, then their signatures in the same order.
 */
export async function recordSignedIn<const D extends readonly AnyDraft[]>(
  db: RimelogDexie,
  drafts: D,
  sign: (entry: StoredLocalEntry) => Promise<EntryDraft<"signature">>,
  now = new Date(),
): Promise<RecordedOf<D>> {
  let stored: StoredLocalEntry[];
  try {
    const [session, deviceId] = await db.getMetas("session", "deviceId");
    const problem = sessionProblem(session, now.getTime()) ?? (deviceId ? null : NO_DEVICE());
    if (problem || !session || !deviceId) throw problem;
    const signer = { user: session.user, deviceId };
    const records = prepare(drafts, signer, now).stored;
    const signatures: EntryInput[] = [];
    for (const r of records) signatures.push(buildEntry(await sign(r), signer.user.id, signer.deviceId, now));
    const all = ready([...records, ...signatures], now);
    if (!(await writePrepared(db, signer, all, now)))
      throw new LocalWriteError(
        "no_session",
        "Someone else signed in on this tablet while you were signing: nothing was saved. Sign in again and repeat it.",
      );
    stored = all.stored.slice(0, records.length);
  } catch (e) {
    throw toLocalWriteError(e);
  }
  emitLocalWrite();
  return stored as RecordedOf<D>;
}

/** Keep a photo or file on the tablet for upload; entries refer to it by the returned id. */
export async function putAttachmentIn(
  db: RimelogDexie,
  blob: Blob,
  { fileName, mime }: { fileName: string; mime: string },
): Promise<string> {
  if (blob.size > MAX_ATTACHMENT_BYTES) {
    throw new LocalWriteError(
      "invalid",
      `This file is ${(blob.size / 1048576).toFixed(1)} MB; the limit is ${MAX_ATTACHMENT_BYTES / 1048576} MB.`,
    );
  }
  if (blob.size === 0) throw new LocalWriteError("invalid", "This file is empty.");
  const id = crypto.randomUUID();
  try {
    await db.transaction("rw", [db.attachments, db.meta], async () => {
      const session = await db.getMeta("session");
      const problem = sessionProblem(session);
      if (problem || !session) throw problem;
      await db.attachments.add({
        id,
        blob,
        fileName: fileName.slice(0, 200),
        mime,
        bytes: blob.size,
        authorId: session.user.id,
        createdAt: new Date().toISOString(),
        state: "pending",
        rejection: null,
      });
    });
  } catch (e) {
    throw toLocalWriteError(e);
  }
  emitLocalWrite();
  return id;
}
