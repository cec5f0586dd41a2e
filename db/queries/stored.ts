// Row → protocol shape for log entries (dates as ISO strings, as the tablet wrote them).
import type { EntryRow } from "@/db/schema";
import type { StoredEntry } from "@/lib/schemas/entry";

/**
 * A database row as the protocol's entry. Every row passed parseEntry (its kind's payload schema)
 * before appendEntries wrote it, and the table refuses updates, so kind and payload agree: the one
 * place the row's untyped JSON is taken as its kind's payload.
 */
export function toStoredRow(row: EntryRow): StoredEntry {
  return {
    id: row.id,
    chain: row.chain,
    cryostatId: row.cryostatId,
    runId: row.runId,
    kind: row.kind,
    payload: row.payload,
    authorId: row.authorId,
    deviceId: row.deviceId,
    recordedAt: row.recordedAt.toISOString(),
    supersedes: row.supersedes,
    reason: row.reason,
    seq: row.seq,
    receivedAt: row.receivedAt.toISOString(),
    prevHash: row.prevHash,
    hash: row.hash,
  } as StoredEntry;
}
