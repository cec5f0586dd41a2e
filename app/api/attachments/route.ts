// POST /api/attachments — upload one file (raw bytes). Same origin only, with the tablet's id in
// a custom header (so a cross-site form cannot send it), bounded in size, typed by magic bytes,
// stored under a server-made name. Retrying the same id and bytes answers the same.
import { createHash } from "node:crypto";
import { z } from "zod";
import { getDb } from "@/db";
import { getAttachment, saveAttachment } from "@/db/queries/attachments";
import { env } from "@/lib/env";
import { AppError } from "@/lib/errors";
import { requireUser } from "@/server/auth/require";
import { handle, json } from "@/server/http/respond";
import { readUploadBytes, requireByteUpload, uploadHeader } from "@/server/http/upload";
import { cleanFileName, fileStore, MAX_ATTACHMENT_BYTES, newStorageKey, sniffType } from "@/server/storage/objects";

export const dynamic = "force-dynamic";

export async function POST(req: Request) {
  return handle(async () => {
    const user = await requireUser();
    requireByteUpload(req, "attachment");
    const id = z.uuid().safeParse(req.headers.get("x-rimelog-attachment-id"));
    if (!id.success)
      throw new AppError("bad_request", "attachment", "The upload needs the attachment id the tablet made (a UUID).");
    const tooLarge = () => `The file is over ${MAX_ATTACHMENT_BYTES / 1048576} MB.`;
    const bytes = await readUploadBytes(req, { surface: "attachment", maxBytes: MAX_ATTACHMENT_BYTES, tooLarge });
    if (bytes.length > MAX_ATTACHMENT_BYTES) throw new AppError("too_large", "attachment", tooLarge());
    if (bytes.length === 0) throw new AppError("bad_request", "attachment", "The file is empty.");
    const type = sniffType(bytes);
    if (!type)
      throw new AppError(
        "unsupported",
        "attachment",
        "Only photos (JPEG, PNG, WebP), PDF and plain-text files are accepted.",
      );
    const sha256 = createHash("sha256").update(bytes).digest("hex");
    const rawName = uploadHeader(req, "x-rimelog-file-name");
    const db = await getDb();
    const existing = await getAttachment(db, { id: id.data });
    if (existing) {
      if (existing.sha256 !== sha256)
        throw new AppError("conflict", "attachment", "Another file is already stored under this id.");
      return json({ id: existing.id, bytes: existing.bytes, mime: existing.mime, sha256 });
    }
    const storageKey = newStorageKey();
    await fileStore(env().RIMELOG_STORAGE_DIR).put(storageKey, bytes);
    const { row } = await saveAttachment(db, {
      id: id.data,
      fileName: cleanFileName(rawName, type.ext),
      mime: type.mime,
      bytes: bytes.length,
      sha256,
      storageKey,
      uploadedBy: user.id,
    });
    if (row.sha256 !== sha256)
      throw new AppError("conflict", "attachment", "Another file is already stored under this id.");
    return json({ id: row.id, bytes: row.bytes, mime: row.mime, sha256 }, 201);
  });
}
