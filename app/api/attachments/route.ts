// POST /api/attachments — upload one file (raw bytes). Same origin only, with the tablet's id in
// a custom header (so a cross-site form cannot send it), bounded in size, typed by magic bytes,
// stored under a server-made name. Retrying the same id and bytes answers the same.
import { z } from "zod";
import { AppError } from "@/lib/errors";
import { json } from "@/server/http/respond";
import { parseInput, route } from "@/server/http/route";
import { uploadHeader } from "@/server/http/upload";
import { MAX_ATTACHMENT_BYTES, type Sniffed, sniffType } from "@/server/storage/objects";
import { receiveUpload } from "@/server/storage/uploads";

export const dynamic = "force-dynamic";

const tooLarge = () => `The file is over ${MAX_ATTACHMENT_BYTES / 1048576} MB.`;

/** A photo, PDF or plain-text file, by its bytes. */
function identify(bytes: Uint8Array): Sniffed {
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

export const POST = route({ access: "signed-in", surface: "attachment", body: "bytes" }, async ({ req, db, user }) => {
  const id = parseInput(z.uuid(), req.headers.get("x-rimelog-attachment-id"), {
    surface: "attachment",
    invalid: "The upload needs the attachment id the tablet made (a UUID).",
  });
  const fileName = uploadHeader(req, "x-rimelog-file-name");
  const spec = { surface: "attachment", id, fileName, uploadedBy: user.id, maxBytes: MAX_ATTACHMENT_BYTES };
  const { row, sha256, created } = await receiveUpload(db, req, { ...spec, tooLarge, identify });
  return json({ id: row.id, bytes: row.bytes, mime: row.mime, sha256 }, created ? 201 : 200);
});
