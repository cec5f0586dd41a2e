// Row → protocol shape for log entries (dates as ISO strings, as the tablet wrote them).
import type { EntryRow } from "@/db/schema";
import type { StoredEntry } from "@/lib/schemas/entry";

export function toStoredRow(row: EntryRow): StoredEntry {
  return {
    id: row.id,
    chain: row.chain,
    cryostatId: row.cryostatId,
    runId: row.runId,
    kind: row.kind as StoredEntry["kind"],
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
  };
}
