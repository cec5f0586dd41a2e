// The one upload sequence (photos from the tablet, the facility's rules PDF): read the bytes
// (refused early on the declared length), decide what they are from the bytes themselves, then
// store them under a server-made key and record them, idempotently by id. The route has already
// checked the request (same origin, application/octet-stream: server/http/route.ts).
import "server-only";
import { createHash, randomUUID } from "node:crypto";
import type { Db } from "@/db";
import { getAttachment, saveAttachment } from "@/db/queries/attachments";
import type { Attachment } from "@/db/schema";
import { env } from "@/lib/env";
import { AppError } from "@/lib/errors";
import { readUploadBytes, uploadHeader } from "@/server/http/upload";
import { cleanFileName, fileStore, MAX_ATTACHMENT_BYTES, newStorageKey, type Sniffed, sniffType } from "./objects";

export type UploadSpec = {
  /** The error code's surface ("attachment", "rules_document"). */
  surface: string;
  /** The id the tablet made for this file (a retry with the same bytes answers the same); a new one when absent. */
  id?: string;
  /** The file name as the page sent it (decoded); cleaned before it is stored. */
  fileName: string;
  uploadedBy: string;
  maxBytes: number;
  /** The refusal when the declared length is over `maxBytes`. */
  tooLarge: (declaredBytes: number) => string;
  /** What the bytes are, by their content; throws the AppError that refuses them. */
  identify: (bytes: Uint8Array) => Sniffed;
};

export type StoredUpload = { row: Attachment; sha256: string; created: boolean };

export async function receiveUpload(db: Db, req: Request, spec: UploadSpec): Promise<StoredUpload> {
  const { surface } = spec;
  const bytes = await readUploadBytes(req, { surface, maxBytes: spec.maxBytes, tooLarge: spec.tooLarge });
  const type = spec.identify(bytes);
  const sha256 = createHash("sha256").update(bytes).digest("hex");
  const id = spec.id ?? randomUUID();
  const conflict = () => new AppError("conflict", surface, "Another file is already stored under this id.");
  const existing = spec.id ? await getAttachment(db, { id }) : undefined;
  if (existing) {
    if (existing.sha256 !== sha256) throw conflict();
    return { row: existing, sha256, created: false };
  }
  const storageKey = newStorageKey();
  await fileStore(env().RIMELOG_STORAGE_DIR).put(storageKey, bytes);
  const { row } = await saveAttachment(db, {
    id,
    fileName: cleanFileName(spec.fileName, type.ext),
    mime: type.mime,
    bytes: bytes.length,
    sha256,
    storageKey,
    uploadedBy: spec.uploadedBy,
  });
  if (row.sha256 !== sha256) throw conflict();
  return { row, sha256, created: true };
}

const tooLarge = () => `The file is over ${MAX_ATTACHMENT_BYTES / 1048576} MB.`;

/** A photo, PDF or plain-text file, by its bytes. */
function identifyAttachment(bytes: Uint8Array): Sniffed {
  if (bytes.length > MAX_ATTACHMENT_BYTES) throw new AppError("too_large", "attachment", tooLarge());
  if (bytes.length === 0) throw new AppError("bad_request", "attachment", "The file is empty.");
  const type = sniffType(bytes);
  if (type) return type;
  throw new AppError(
    "unsupported",
    "attachment",
    "Only photos (JPEG, PNG, WebP), PDF and plain-text files are accepted.",
  );
}

/**
 * A file from the tablet (POST /api/attachments) under the id the tablet made (`id`, already
 * checked), its name from the x-rimelog-file-name header (URI-encoded).
 */
export function receiveAttachment(db: Db, req: Request, opts: { id: string; uploadedBy: string }) {
  return receiveUpload(db, req, {
    surface: "attachment",
    id: opts.id,
    fileName: uploadHeader(req, "x-rimelog-file-name"),
    uploadedBy: opts.uploadedBy,
    maxBytes: MAX_ATTACHMENT_BYTES,
    tooLarge,
    identify: identifyAttachment,
  });
}

/** A stored file's record and bytes; null when there is no record or its bytes are gone. */
export async function readStoredFile(
  db: Db,
  id: string,
): Promise<{ row: Attachment; bytes: Uint8Array | null } | null> {
  const row = await getAttachment(db, { id });
  if (!row) return null;
  return { row, bytes: await fileStore(env().RIMELOG_STORAGE_DIR).get(row.storageKey) };
}
