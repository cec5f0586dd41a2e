// Verifying one hash chain (tamper evidence): recompute every link, compare with the chain head and
// with the server's signed checkpoints, and name the first bad entry and what happened to it — changed,
// inserted, deleted, reordered, truncated, or the whole tail recomputed after a change (which only a
// signed checkpoint can catch). Pure: the rows come from the database, the checkpoints from the
// database and the key directory, already checked against the server's public key.
import type { ServerFields, UncheckedEntry } from "@/lib/schemas/entry";
import { genesisHash, linkHash } from "@/lib/sync/hash";

/** A row as the database holds it: verified by its hashes here, not assumed to match its schema. */
export type ChainRow = UncheckedEntry & Omit<ServerFields, "chain"> & { chain?: string };
export type ChainHead = { seq: number; hash: string };
export type TrustedCheckpoint = { seq: number; hash: string; signedAt: string };

export type BreakKind = "changed" | "inserted" | "deleted" | "reordered" | "truncated" | "recomputed";

export type ChainVerdict =
  | { ok: true; chain: string; count: number; head: ChainHead | null; checkpointsChecked: number }
  | {
      ok: false;
      chain: string;
      count: number;
      kind: BreakKind;
      /** The first entry that fails; absent when what is missing is the end of the chain. */
      firstBad: { id: string; seq: number; kind: string; recordedAt: string } | null;
      /** The last entry before the break that still verifies (null: the break is at the start). */
      lastGoodSeq: number | null;
      message: string;
      checkpointsChecked: number;
    };

const describe = (r: ChainRow) => ({ id: r.id, seq: r.seq, kind: r.kind, recordedAt: r.recordedAt });

function ownHashOk(r: ChainRow): boolean {
  return linkHash(r.prevHash, r, r.seq, r.receivedAt) === r.hash;
}

/**
 * Verify a chain. `rows` in any order (sorted here by seq); `head` is the server's chain head
 * record; `checkpoints` are signed heads whose signatures have already been verified.
 */
export function verifyChain(
  chain: string,
  rowsIn: readonly ChainRow[],
  { head = null, checkpoints = [] }: { head?: ChainHead | null; checkpoints?: readonly TrustedCheckpoint[] } = {},
): ChainVerdict {
  const rows = [...rowsIn].sort((a, b) => a.seq - b.seq);
  const count = rows.length;
  const cps = [...checkpoints].sort((a, b) => a.seq - b.seq);
  const fail = (kind: BreakKind, bad: ChainRow | null, lastGoodSeq: number | null, message: string): ChainVerdict => ({
    ok: false,
    chain,
    count,
    kind,
    firstBad: bad ? describe(bad) : null,
    lastGoodSeq,
    message,
    checkpointsChecked: cps.length,
  });
  const positionOfHash = new Map(rows.map((r, i) => [r.hash, i]));

  // 1. Every link, in seq order.
  for (let i = 0; i < rows.length; i++) {
    const row = rows[i]!;
    const prev = rows[i - 1];
    const expectedPrev = prev ? prev.hash : genesisHash(chain);
    const ownOk = ownHashOk(row);
    const linkOk = row.prevHash === expectedPrev;
    if (ownOk && linkOk) continue;
    const lastGood = prev ? prev.seq : null;
    const linkedTo = positionOfHash.get(row.prevHash);
    if (linkedTo !== undefined && linkedTo > i) {
      return fail(
        "reordered",
        row,
        lastGood,
        `Entry seq ${row.seq} is out of order: it links to an entry that now comes after it. Rows were reordered in the database.`,
      );
    }
    const next = rows[i + 1];
    if (!linkOk && ((next && next.prevHash === expectedPrev) || (!next && head && head.hash === expectedPrev))) {
      return fail(
        "inserted",
        row,
        lastGood,
        `Entry seq ${row.seq} was inserted into the chain: the entries around it link to each other, not to it.`,
      );
    }
    if (!ownOk) {
      return fail(
        "changed",
        row,
        lastGood,
        `Entry seq ${row.seq} was changed after it was stored: its content no longer matches its hash.`,
      );
    }
    if (linkedTo === undefined) {
      return fail(
        "deleted",
        row,
        lastGood,
        `The entry before seq ${row.seq}${prev ? ` (after seq ${prev.seq})` : ""} is missing: it was deleted, or the entry before it was changed and its hash recomputed.`,
      );
    }
    return fail(
      "reordered",
      row,
      lastGood,
      `Entry seq ${row.seq} links to an earlier entry than the one before it: rows were reordered or removed.`,
    );
  }

  const last = rows.at(-1);
  // 2. The stored head: the chain must end exactly there.
  if (head) {
    if (!last || head.seq > last.seq || !positionOfHash.has(head.hash)) {
      return fail(
        "truncated",
        null,
        last?.seq ?? null,
        `The chain ends at ${last ? `seq ${last.seq}` : "its start"} but its head says seq ${head.seq}: entries at the end were removed.`,
      );
    }
    if (last.seq > head.seq) {
      const extra = rows.find((r) => r.seq > head.seq)!;
      return fail(
        "inserted",
        extra,
        head.seq,
        `Entry seq ${extra.seq} lies beyond the chain head (seq ${head.seq}): it was added to the database directly.`,
      );
    }
  }

  // 3. Signed checkpoints: the row at each signed seq must carry the signed hash.
  let lastMatching: TrustedCheckpoint | null = null;
  for (const cp of cps) {
    const at = rows.find((r) => r.seq === cp.seq);
    if (!at) {
      if (!last || cp.seq > last.seq) {
        return fail(
          "truncated",
          null,
          last?.seq ?? null,
          `A checkpoint signed ${cp.signedAt} vouches for seq ${cp.seq}, beyond the chain's last entry${last ? ` (seq ${last.seq})` : ""}: entries at the end were removed.`,
        );
      }
      const after = rows.find((r) => r.seq > cp.seq) ?? null;
      return fail(
        "deleted",
        after,
        lastMatching?.seq ?? null,
        `The entry at seq ${cp.seq}, vouched for by a checkpoint signed ${cp.signedAt}, is missing from the chain.`,
      );
    }
    if (at.hash !== cp.hash) {
      const firstSuspect = rows.find((r) => r.seq > (lastMatching?.seq ?? -Infinity)) ?? at;
      return fail(
        "recomputed",
        firstSuspect,
        lastMatching?.seq ?? null,
        `The chain was recomputed: at seq ${cp.seq} it no longer matches the checkpoint signed ${cp.signedAt}. An entry from seq ${firstSuspect.seq} to seq ${cp.seq} was changed and the hashes after it rewritten.`,
      );
    }
    lastMatching = cp;
  }
  return {
    ok: true,
    chain,
    count,
    head: last ? { seq: last.seq, hash: last.hash } : null,
    checkpointsChecked: cps.length,
  };
}

/** One chain's verdict as the server reports it, with the checkpoints it could not trust. */
export type ChainReport = ChainVerdict & { untrustedCheckpoints: number; checkedAt: string };
