// Chain check and signed checkpoints against the database: load a chain, its head and its
// checkpoints (database copy plus the server's file copy), check each checkpoint's Ed25519
// signature against the server's own key, and verify (lib/audit/chain.ts).
import "server-only";
import { desc, eq } from "drizzle-orm";
import type { Db } from "@/db/client";
import { chainCheckpoints, chainHeads, entries } from "@/db/schema";
import { type ChainReport, type TrustedCheckpoint, verifyChain } from "@/lib/audit/chain";
import type { Checkpoint, CheckpointKeys } from "@/lib/audit/checkpoint";
import { toStoredRow } from "./stored";

/** How often a chain head is signed while the chain grows. */
export const CHECKPOINT_INTERVAL_MS = 10 * 60_000;

export async function listChains(db: Db): Promise<{ chain: string; seq: number; hash: string }[]> {
  return db.select().from(chainHeads).orderBy(chainHeads.chain);
}

async function dbCheckpoints(db: Db, chain: string): Promise<Checkpoint[]> {
  const rows = await db.select().from(chainCheckpoints).where(eq(chainCheckpoints.chain, chain));
  return rows.map((r) => ({
    chain: r.chain,
    seq: r.seq,
    hash: r.hash,
    signedAt: r.signedAt.toISOString(),
    signature: r.signature,
    publicKey: r.publicKey,
  }));
}

/**
 * Sign every chain head that has moved since its last checkpoint (or whose last checkpoint is
 * older than `minAgeMs`, when given). Returns the new checkpoints.
 */
export async function signChainHeads(
  db: Db,
  { keys, now = new Date(), minAgeMs = 0 }: { keys: CheckpointKeys; now?: Date; minAgeMs?: number },
): Promise<Checkpoint[]> {
  const out: Checkpoint[] = [];
  for (const head of await listChains(db)) {
    const [last] = await db
      .select()
      .from(chainCheckpoints)
      .where(eq(chainCheckpoints.chain, head.chain))
      .orderBy(desc(chainCheckpoints.seq))
      .limit(1);
    if (last && last.seq === head.seq && last.hash === head.hash) continue;
    if (last && now.getTime() - last.signedAt.getTime() < minAgeMs) continue;
    const cp = keys.sign(head, now.toISOString());
    await db.insert(chainCheckpoints).values({
      chain: cp.chain,
      seq: cp.seq,
      hash: cp.hash,
      signature: cp.signature,
      publicKey: cp.publicKey,
      signedAt: now,
    });
    keys.appendLog(cp);
    out.push(cp);
  }
  return out;
}

export type { ChainReport };

/** Verify one chain as stored now. */
export async function checkChain(
  db: Db,
  { chain, keys }: { chain: string; keys: CheckpointKeys },
): Promise<ChainReport> {
  const rows = (await db.select().from(entries).where(eq(entries.chain, chain))).map(toStoredRow);
  const [head] = await db.select().from(chainHeads).where(eq(chainHeads.chain, chain));
  const seen = new Map<string, Checkpoint>();
  for (const cp of [...(await dbCheckpoints(db, chain)), ...keys.readLog().filter((c) => c.chain === chain)]) {
    seen.set(`${cp.seq}:${cp.hash}:${cp.signature}`, cp);
  }
  const trusted: TrustedCheckpoint[] = [];
  let untrusted = 0;
  for (const cp of seen.values()) {
    if (keys.verify(cp)) trusted.push({ seq: cp.seq, hash: cp.hash, signedAt: cp.signedAt });
    else untrusted++;
  }
  const verdict = verifyChain(chain, rows, {
    head: head ? { seq: head.seq, hash: head.hash } : null,
    checkpoints: trusted,
  });
  return { ...verdict, untrustedCheckpoints: untrusted, checkedAt: new Date().toISOString() };
}

/** The first break of each chain (null when it verifies), for the audit flag. */
export async function chainBreaks(db: Db, { keys }: { keys: CheckpointKeys }): Promise<Map<string, number | null>> {
  const out = new Map<string, number | null>();
  for (const { chain } of await listChains(db)) {
    const r = await checkChain(db, { chain, keys });
    // Nothing left to point at when the end was cut off: the whole chain is in doubt.
    out.set(chain, r.ok ? null : (r.firstBad?.seq ?? 0));
  }
  return out;
}
