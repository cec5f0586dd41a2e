// Signed chain heads (R6): an Ed25519 signature over (chain, seq, hash, time) made with a key that
// lives in a file under RIMELOG_KEY_DIR, never in the database. Someone who can rewrite the
// database can recompute a bare hash chain, but not these signatures. A copy of each checkpoint is
// also appended to a file beside the key, so deleting them from the database does not hide a change.
import { appendFileSync, chmodSync, existsSync, mkdirSync, readFileSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { ed25519 } from "@noble/curves/ed25519.js";
import { bytesToHex, hexToBytes } from "@noble/hashes/utils.js";
import { canonicalJson } from "@/lib/sync/hash";

export const KEY_FILE = "chain-signing.key";
export const CHECKPOINT_LOG = "checkpoints.jsonl";

export type SigningKey = { secretKey: Uint8Array; publicKeyHex: string };
export type Checkpoint = {
  chain: string;
  seq: number;
  hash: string;
  signedAt: string;
  signature: string;
  publicKey: string;
};

/** Load the server's signing key, creating it (mode 0600) on first use. */
export function loadOrCreateKey(dir: string): SigningKey {
  mkdirSync(dir, { recursive: true, mode: 0o700 });
  const file = join(dir, KEY_FILE);
  if (!existsSync(file)) {
    const sk = ed25519.utils.randomSecretKey();
    // wx: never overwrite a key another process wrote a moment ago.
    try {
      writeFileSync(file, `${bytesToHex(sk)}\n`, { flag: "wx", mode: 0o600 });
    } catch (e) {
      if ((e as NodeJS.ErrnoException).code !== "EEXIST") throw e;
    }
    chmodSync(file, 0o600);
  }
  const hex = readFileSync(file, "utf8").trim();
  if (!/^[0-9a-f]{64}$/.test(hex))
    throw new Error(`The chain signing key ${file} is not a 32-byte hex key; restore it from backup.`);
  const secretKey = hexToBytes(hex);
  return { secretKey, publicKeyHex: bytesToHex(ed25519.getPublicKey(secretKey)) };
}

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

export function signCheckpoint(
  key: SigningKey,
  head: { chain: string; seq: number; hash: string },
  signedAt = new Date().toISOString(),
): Checkpoint {
  const body = { ...head, signedAt };
  const signature = bytesToHex(ed25519.sign(checkpointMessage(body), key.secretKey));
  return { ...body, signature, publicKey: key.publicKeyHex };
}

/** True when the checkpoint was signed by one of the trusted public keys and is unaltered. */
export function verifyCheckpoint(c: Checkpoint, trustedPublicKeys: readonly string[]): boolean {
  if (!trustedPublicKeys.includes(c.publicKey)) return false;
  try {
    return ed25519.verify(hexToBytes(c.signature), checkpointMessage(c), hexToBytes(c.publicKey));
  } catch {
    return false;
  }
}

export function appendCheckpointLog(dir: string, c: Checkpoint): void {
  mkdirSync(dir, { recursive: true, mode: 0o700 });
  appendFileSync(join(dir, CHECKPOINT_LOG), `${JSON.stringify(c)}\n`, { mode: 0o600 });
}

export function readCheckpointLog(dir: string): Checkpoint[] {
  const file = join(dir, CHECKPOINT_LOG);
  if (!existsSync(file)) return [];
  const out: Checkpoint[] = [];
  for (const line of readFileSync(file, "utf8").split("\n")) {
    if (!line.trim()) continue;
    try {
      out.push(JSON.parse(line) as Checkpoint);
    } catch {
      /* a torn last line after a crash: the database copy still has it */
    }
  }
  return out;
}
