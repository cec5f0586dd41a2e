// The tablet store: the ONE Dexie class with every schema version, its row types, and how it is
// opened (strict durability, so "saved" means on disk, not only in Chromium's write cache).
// Reference data (cryostats, templates, facility rules, calibrations in force, people), local and pulled entries with their sync state, the outbox, push answers not
// yet written into their entries, photo blobs, and sync metadata (device registration, pull cursor, last
// success, the offline session) all live here.
import Dexie, { type DexieOptions, type Table, type Transaction } from "dexie";
import type { CalibrationRecord } from "@/lib/schemas/calibration";
import type { CryostatConfig, CryostatKind } from "@/lib/schemas/cryostat";
import type { EntryInput, EntryInputOf, EntryKind } from "@/lib/schemas/entry";
import type { RulesInForce } from "@/lib/schemas/rules";
import type { TemplateInput } from "@/lib/schemas/run";
import type { PublicUser, SessionUser } from "@/lib/schemas/user";
import type { Accepted } from "@/lib/sync/protocol";

export type SyncState = "pending" | "synced" | "rejected";
export type Rejection = { code: string; message: string; at: string };

/** What the tablet keeps beside an entry: its send state and what the server added once it arrived. */
export type LocalFields = {
  sync: SyncState;
  /** Server order and chain link, null until the server has acknowledged the entry. */
  seq: number | null;
  hash: string | null;
  prevHash: string | null;
  receivedAt: string | null;
  /** Why the server refused it (kept on the tablet and shown; never dropped silently). */
  rejection: Rejection | null;
};

/**
 * An entry on the tablet: what its author wrote, plus what the server added once it arrived. Of
 * the given kind(s), its payload typed by the kind's schema; a union over all kinds by default.
 */
export type StoredLocalEntry<K extends EntryKind = EntryKind> = EntryInputOf<K> & LocalFields;

/** One unsent entry. Rows leave the outbox only when the server has answered for the entry. */
export type OutboxRow = {
  n?: number; // auto-increment: the order of writing on this tablet, which is also the push order
  entryId: string;
  authorId: string;
  queuedAt: string;
  bytes: number;
  /**
   * The entry as it will be pushed, kept with its queue row so a push reads one store in order
   * of writing. Rows queued before schema v3 lack it; their entry is read from `entries`.
   */
  entry?: EntryInput;
};

/**
 * A push answer received but not yet written into the entries it names. Writing an answer is
 * split in two: the receipt and the removal of the answered outbox rows commit together (small
 * writes, so the next batch goes out at once and "pending" drops as the server answers); the
 * entries are then marked synced from the receipts, one receipt a transaction (`foldReceipts`).
 */
export type ReceiptRow = { n?: number; at: string; accepted: Accepted[] };

export type AttachmentState = "pending" | "uploaded" | "rejected";
export type LocalAttachment = {
  id: string;
  blob: Blob;
  fileName: string;
  mime: string;
  bytes: number;
  authorId: string;
  createdAt: string;
  state: AttachmentState;
  rejection: Rejection | null;
};

/** Reference data rows are written as the server sent them (lib/sync/protocol.ts ReferenceData)… */
export type RefRow = { id: string } & Record<string, unknown>;

/**
 * … and read as the rows the server sends (db/queries/reference.ts): a cryostats row over
 * JSON (dates as ISO strings), its config typed by the shared schema.
 */
export type LocalCryostat = {
  id: string;
  name: string;
  kind: CryostatKind;
  location: string;
  config: CryostatConfig;
  updatedAt: string;
};
/** A procedure template version as pulled (every version: a run pins the one it started from). */
export type LocalTemplate = TemplateInput & { id: string; version: number; createdBy: string; createdAt: string };
/** A person this user may see (db/queries/users.ts listPublicUsers). */
export type LocalUser = PublicUser;

export type LocalSession = { user: SessionUser; confirmedAt: string };

export type MetaRow =
  /** The id the server issued to this tablet (POST /api/devices); every entry written here carries it. */
  | { key: "deviceId"; value: string }
  /** The secret that proves this tablet holds its registration (kept across sign-outs, like the id). */
  | { key: "deviceSecret"; value: string }
  /** Set when the server answered that this tablet was withdrawn: nothing more is pushed. */
  | { key: "deviceWithdrawn"; value: { message: string; at: string } | null }
  | { key: "session"; value: LocalSession }
  | { key: "cursor"; value: number }
  | { key: "refHash"; value: string }
  /** The facility rules in force as last pulled (null: the admin has not set them). */
  | { key: "rules"; value: RulesInForce | null }
  | { key: "lastSuccess"; value: string }
  | { key: "lastAttempt"; value: string }
  | { key: "lastError"; value: { code: string; message: string; at: string } | null };
export type MetaKey = MetaRow["key"];
export type MetaValue<K extends MetaKey> = Extract<MetaRow, { key: K }>["value"];

export const LOCAL_DB_NAME = "rimelog";

/**
 * Every schema version of the tablet store, oldest first (Dexie needs them all to upgrade a
 * tablet that skipped versions). A version, once shipped, is never edited: add a new one.
 */
export const SCHEMA_VERSIONS: readonly (readonly [number, Record<string, string>])[] = [
  [
    1,
    {
      entries: "id, cryostatId, runId, sync, seq, authorId, [cryostatId+seq]",
      outbox: "++n, &entryId, authorId",
      attachments: "id, state, authorId",
      cryostats: "id",
      templates: "id, key",
      users: "id",
      meta: "key",
    },
  ],
  // v2: a cryostat's unsent entries by time, so a logbook reads only the newest few.
  [2, { entries: "id, cryostatId, runId, sync, seq, authorId, [cryostatId+seq], [cryostatId+sync+recordedAt]" }],
  // v3: an author's outbox rows in order of writing, so each push batch seeks straight to where
  // the previous one ended (no walk over rows just deleted); entries lose the seq and authorId
  // indexes nothing reads (each index costs on every write).
  [
    3,
    {
      entries: "id, cryostatId, runId, sync, [cryostatId+seq], [cryostatId+sync+recordedAt]",
      outbox: "++n, &entryId, authorId, [authorId+n]",
    },
  ],
  // v4: push answers waiting to be written into their entries (see ReceiptRow); entries by kind
  // (and by cryostat and kind), so "the open runs" or "the last transfer" read only those
  // entries, and a note saved on the same cryostat does not make them read again.
  [
    4,
    {
      entries: "id, cryostatId, runId, sync, kind, [cryostatId+seq], [cryostatId+sync+recordedAt], [cryostatId+kind]",
      receipts: "++n",
    },
  ],
  // v5: the sensor calibration tables in force, pulled with the reference data (by cryostat, so a
  // reading form reads only its cryostat's tables).
  [5, { calibrations: "id, cryostatId" }],
];

/**
 * Data changes made when a tablet first opens a version (after its stores are changed). v5
 * forgets the reference data's hash, so the next pull brings the whole reference again,
 * calibrations included, even if the server's copy looked unchanged.
 */
export const SCHEMA_UPGRADES: Readonly<Record<number, (tx: Transaction) => Promise<unknown>>> = {
  5: (tx) => tx.table("meta").delete("refHash"),
};

export class RimelogDexie extends Dexie {
  entries!: Table<StoredLocalEntry, string>;
  outbox!: Table<OutboxRow, number>;
  receipts!: Table<ReceiptRow, number>;
  attachments!: Table<LocalAttachment, string>;
  cryostats!: Table<LocalCryostat, string, RefRow>;
  templates!: Table<LocalTemplate, string, RefRow>;
  calibrations!: Table<CalibrationRecord, string>;
  users!: Table<LocalUser, string, RefRow>;
  meta!: Table<MetaRow, string>;

  constructor(name = LOCAL_DB_NAME, options: DexieOptions = {}) {
    // Chromium commits IndexedDB transactions with relaxed durability by default: a crash right
    // after "saved" could lose the entry. Strict waits for the write to reach the disk.
    super(name, { chromeTransactionDurability: "strict", ...options });
    for (const [version, stores] of SCHEMA_VERSIONS) {
      const upgrade = SCHEMA_UPGRADES[version];
      const v = this.version(version).stores(stores);
      if (upgrade) v.upgrade(upgrade);
    }
  }

  async getMeta<K extends MetaKey>(key: K): Promise<MetaValue<K> | undefined> {
    const row = await this.meta.get(key);
    return row?.value as MetaValue<K> | undefined;
  }

  /** Several meta values in one read (one request, however many keys). */
  async getMetas<const K extends readonly MetaKey[]>(
    ...keys: K
  ): Promise<{ [I in keyof K]: MetaValue<K[I]> | undefined }> {
    const rows = await this.meta.bulkGet([...keys]);
    return rows.map((r) => r?.value) as { [I in keyof K]: MetaValue<K[I]> | undefined };
  }

  async setMeta<K extends MetaKey>(key: K, value: MetaValue<K>): Promise<void> {
    await this.meta.put({ key, value } as MetaRow);
  }
}

let singleton: RimelogDexie | undefined;
let syncConnection: RimelogDexie | undefined;

function assertBrowser(): void {
  if (typeof indexedDB === "undefined")
    throw new Error("The tablet store needs a browser (IndexedDB is not available here).");
}

/** The tablet's store (browser only). Tests make their own with `new RimelogDexie(name, opts)`. */
export function localDb(): RimelogDexie {
  assertBrowser();
  singleton ??= new RimelogDexie();
  return singleton;
}

/**
 * The sync loop's own connection to the same store, committing with relaxed durability. Its
 * writes only record what the server already holds (answers to a push, pulled copies, the pull
 * cursor, sync times): one lost in a crash is redone by the next round, and the server answers a
 * repeated push the same way. Relaxed commits hold the store for less time, so a tap's strict
 * write does not queue behind a disk flush made for bookkeeping. Entries are only ever created
 * through localDb() (strict).
 */
export function localSyncDb(): RimelogDexie {
  assertBrowser();
  syncConnection ??= new RimelogDexie(LOCAL_DB_NAME, { chromeTransactionDurability: "relaxed" });
  return syncConnection;
}
