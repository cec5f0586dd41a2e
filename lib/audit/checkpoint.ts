// Signed chain heads: an Ed25519 signature over (chain, seq, hash, time) made with a key the server
// keeps outside the database. Someone who can rewrite the database can recompute a bare hash chain,
// but not these signatures. This module holds the shapes and the signed message; the key itself and
// its file copy of every checkpoint live in the server (server/audit/keys.ts), behind `CheckpointKeys`.
import { canonicalJson } from "@/lib/sync/hash";

export type Checkpoint = {
  chain: string;
  seq: number;
  hash: string;
  signedAt: string;
  signature: string;
  publicKey: string;
};

/** The server's signing key and its append-only copy of the checkpoints it signed. */
export type CheckpointKeys = {
  publicKeyHex: string;
  sign(head: { chain: string; seq: number; hash: string }, signedAt?: string): Checkpoint;
  /** True when the checkpoint was signed by one of the trusted keys and is unaltered. */
  verify(c: Checkpoint): boolean;
  appendLog(c: Checkpoint): void;
  readLog(): Checkpoint[];
};

/** The exact bytes that are signed: canonical JSON (RFC 8785) with a purpose tag. */
export function checkpointMessage(c: { chain: string; seq: number; hash: string; signedAt: string }): Uint8Array {
  return new TextEncoder().encode(
    canonicalJson({
      purpose: "rimelog-chain-checkpoint",
      chain: c.chain,
      seq: c.seq,
      hash: c.hash,
      signedAt: c.signedAt,
    }),
  );
}
