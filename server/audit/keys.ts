// The chain-signing key on disk: a 32-byte Ed25519 secret (hex, mode 0600) in RIMELOG_KEY_DIR,
// never in the database, used through node:crypto. A copy of each checkpoint is appended to a
// file beside the key, so deleting them from the database does not hide a change.
import "server-only";
import {
  createPrivateKey,
  createPublicKey,
  sign as edSign,
  verify as edVerify,
  type KeyObject,
  randomBytes,
} from "node:crypto";
import { appendFileSync, chmodSync, existsSync, mkdirSync, readFileSync, writeFileSync } from "node:fs";
import { join, resolve } from "node:path";
import { type Checkpoint, type CheckpointKeys, checkpointMessage } from "@/lib/audit/checkpoint";
import { env } from "@/lib/env";

export const KEY_FILE = "chain-signing.key";
export const CHECKPOINT_LOG = "checkpoints.jsonl";

// DER prefixes that wrap a raw 32-byte Ed25519 key as PKCS #8 (private) and SPKI (public), RFC 8410.
const PKCS8_PREFIX = Buffer.from("302e020100300506032b657004220420", "hex");
const SPKI_PREFIX = Buffer.from("302a300506032b6570032100", "hex");

export type SigningKey = { privateKey: KeyObject; publicKeyHex: string };

function publicKeyFromHex(hex: string): KeyObject {
  return createPublicKey({ key: Buffer.concat([SPKI_PREFIX, Buffer.from(hex, "hex")]), format: "der", type: "spki" });
}

/** Load the server's signing key, creating it (mode 0600) on first use. */
export function loadOrCreateKey(dir: string): SigningKey {
  mkdirSync(dir, { recursive: true, mode: 0o700 });
  const file = join(dir, KEY_FILE);
  if (!existsSync(file)) {
    // wx: never overwrite a key another process wrote a moment ago.
    try {
      writeFileSync(file, `${randomBytes(32).toString("hex")}\n`, { flag: "wx", mode: 0o600 });
    } catch (e) {
      if ((e as NodeJS.ErrnoException).code !== "EEXIST") throw e;
    }
    chmodSync(file, 0o600);
  }
  const hex = readFileSync(file, "utf8").trim();
  if (!/^[0-9a-f]{64}$/.test(hex))
    throw new Error(`The chain signing key ${file} is not a 32-byte hex key; restore it from backup.`);
  const privateKey = createPrivateKey({
    key: Buffer.concat([PKCS8_PREFIX, Buffer.from(hex, "hex")]),
    format: "der",
    type: "pkcs8",
  });
  const spki = createPublicKey(privateKey).export({ format: "der", type: "spki" });
  return { privateKey, publicKeyHex: spki.subarray(SPKI_PREFIX.length).toString("hex") };
}

export function signCheckpoint(
  key: SigningKey,
  head: { chain: string; seq: number; hash: string },
  signedAt = new Date().toISOString(),
): Checkpoint {
  const body = { chain: head.chain, seq: head.seq, hash: head.hash, signedAt };
  const signature = edSign(null, checkpointMessage(body), key.privateKey).toString("hex");
  return { ...body, signature, publicKey: key.publicKeyHex };
}

/** True when the checkpoint was signed by one of the trusted public keys and is unaltered. */
export function verifyCheckpoint(c: Checkpoint, trustedPublicKeys: readonly string[]): boolean {
  if (!trustedPublicKeys.includes(c.publicKey)) return false;
  try {
    return edVerify(null, checkpointMessage(c), publicKeyFromHex(c.publicKey), Buffer.from(c.signature, "hex"));
  } catch {
    return false;
  }
}

function readCheckpointLog(dir: string): Checkpoint[] {
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

/** The key and checkpoint log of one directory, as the chain queries use them. */
export function fileCheckpointKeys(dir: string): CheckpointKeys {
  const key = loadOrCreateKey(dir);
  return {
    publicKeyHex: key.publicKeyHex,
    sign: (head, signedAt) => signCheckpoint(key, head, signedAt),
    verify: (c) => verifyCheckpoint(c, [key.publicKeyHex]),
    appendLog(c) {
      mkdirSync(dir, { recursive: true, mode: 0o700 });
      appendFileSync(join(dir, CHECKPOINT_LOG), `${JSON.stringify(c)}\n`, { mode: 0o600 });
    },
    readLog: () => readCheckpointLog(dir),
  };
}

export function keyDir(): string {
  return resolve(env().RIMELOG_KEY_DIR);
}

/** The server's own checkpoint keys (RIMELOG_KEY_DIR). */
export function checkpointKeys(): CheckpointKeys {
  return fileCheckpointKeys(keyDir());
}
