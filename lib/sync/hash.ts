// Canonical JSON (RFC 8785, via the `canonicalize` package) and SHA-256 hashes for the log:
// the per-cryostat hash chain and the hash a signature binds to. Runs on the tablet and the server.

import { sha256 } from "@noble/hashes/sha2.js";
import { bytesToHex, utf8ToBytes } from "@noble/hashes/utils.js";
import canonicalize from "canonicalize";
import type { UncheckedEntry } from "@/lib/schemas/entry";

/** Strings normalised to NFC so that the same text typed on two tablets hashes the same. */
export function normalise(value: unknown): unknown {
  if (typeof value === "string") return value.normalize("NFC");
  if (Array.isArray(value)) return value.map(normalise);
  if (value && typeof value === "object") {
    const out: Record<string, unknown> = {};
    for (const [k, v] of Object.entries(value)) if (v !== undefined) out[k.normalize("NFC")] = normalise(v);
    return out;
  }
  return value;
}

export function canonicalJson(value: unknown): string {
  const s = canonicalize(normalise(value));
  if (s === undefined) throw new TypeError("value cannot be serialised as canonical JSON");
  return s;
}

export function sha256Hex(text: string): string {
  return bytesToHex(sha256(utf8ToBytes(text)));
}

/** The content of an entry that its author wrote (what a signature binds to). */
export function recordContent(e: UncheckedEntry) {
  return {
    id: e.id,
    cryostatId: e.cryostatId,
    runId: e.runId,
    kind: e.kind,
    payload: e.payload,
    authorId: e.authorId,
    deviceId: e.deviceId,
    recordedAt: e.recordedAt,
    supersedes: e.supersedes,
    reason: e.reason,
  };
}

/** recordHash: SHA-256 of the canonical JSON of the record content. */
export function recordHash(e: UncheckedEntry): string {
  return sha256Hex(canonicalJson(recordContent(e)));
}

/** The chain a record belongs to: its cryostat, or the facility chain for facility-wide records. */
export function chainOf(cryostatId: string | null): string {
  return cryostatId ?? "facility";
}

export function genesisHash(chain: string): string {
  return sha256Hex(`rimelog-genesis:${chain}`);
}

/** The text a chain link hashes: prevHash + canonical entry including its server sequence number. */
export function linkText(prevHash: string, e: UncheckedEntry, seq: number, receivedAt: string): string {
  return prevHash + canonicalJson({ ...recordContent(e), seq, receivedAt });
}

/** Chain link: SHA-256 of linkText (the server computes the same with node's native SHA-256). */
export function linkHash(prevHash: string, e: UncheckedEntry, seq: number, receivedAt: string): string {
  return sha256Hex(linkText(prevHash, e, seq, receivedAt));
}
