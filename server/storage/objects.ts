// The attachment storage layer: a small object-store interface and its local filesystem
// implementation under RIMELOG_STORAGE_DIR, plus what a stored file may be (type decided by its
// magic bytes, never by the name or the client's word) and how large. Server only.
import "server-only";
import { randomUUID } from "node:crypto";
import { mkdir, readFile, rename, writeFile } from "node:fs/promises";
import { join, resolve } from "node:path";

export interface ObjectStore {
  put(key: string, bytes: Uint8Array): Promise<void>;
  get(key: string): Promise<Uint8Array | null>;
}

/** Largest file accepted: photos of gauges, the facility's rules PDF, calibration tables. */
export const MAX_ATTACHMENT_BYTES = 15 * 1024 * 1024;

const KEY = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/;

/** A storage key the server makes up; file names from clients never reach the disk. */
export function newStorageKey(): string {
  return randomUUID();
}

export function fileStore(dir: string): ObjectStore {
  const root = resolve(dir);
  const path = (key: string) => {
    if (!KEY.test(key)) throw new Error(`bad storage key ${JSON.stringify(key)}`);
    return join(root, key.slice(0, 2), key);
  };
  return {
    async put(key, bytes) {
      const p = path(key);
      await mkdir(join(root, key.slice(0, 2)), { recursive: true });
      // Write then rename: a crash never leaves a half-written file under the final name.
      const tmp = `${p}.${process.pid}.tmp`;
      await writeFile(tmp, bytes, { flag: "wx" });
      await rename(tmp, p);
    },
    async get(key) {
      try {
        return new Uint8Array(await readFile(path(key)));
      } catch (e) {
        if ((e as NodeJS.ErrnoException).code === "ENOENT") return null;
        throw e;
      }
    },
  };
}

export type Sniffed = { mime: string; ext: string };

const startsWith = (b: Uint8Array, sig: number[], at = 0) => sig.every((v, i) => b[at + i] === v);

/**
 * The file's type from its first bytes: JPEG, PNG, WebP, PDF, or plain UTF-8 text (calibration
 * tables, CSV). Anything else is refused.
 */
export function sniffType(b: Uint8Array): Sniffed | null {
  if (startsWith(b, [0xff, 0xd8, 0xff])) return { mime: "image/jpeg", ext: "jpg" };
  if (startsWith(b, [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a])) return { mime: "image/png", ext: "png" };
  if (startsWith(b, [0x52, 0x49, 0x46, 0x46]) && startsWith(b, [0x57, 0x45, 0x42, 0x50], 8))
    return { mime: "image/webp", ext: "webp" };
  if (startsWith(b, [0x25, 0x50, 0x44, 0x46, 0x2d])) return { mime: "application/pdf", ext: "pdf" };
  if (b.length > 0 && !b.includes(0)) {
    try {
      new TextDecoder("utf-8", { fatal: true }).decode(b.subarray(0, Math.min(b.length, 65536)));
      return { mime: "text/plain; charset=utf-8", ext: "txt" };
    } catch {
      /* not UTF-8 text */
    }
  }
  return null;
}

/** A file name fit to show and to offer in a download: no paths, no control characters. */
export function cleanFileName(raw: string, ext: string): string {
  const base = raw.split(/[\\/]/).pop() ?? "";
  const cleaned = base
    // biome-ignore lint/suspicious/noControlCharactersInRegex: removing control characters is the point
    .replace(/[\u0000-\u001f\u007f"<>|:*?]/g, "")
    .trim()
    .slice(0, 120);
  return cleaned || `file.${ext}`;
}
