// POST /api/attachments — upload one file (raw bytes). Same origin only, with the tablet's id in
// a custom header (so a cross-site form cannot send it), bounded in size, typed by magic bytes,
// stored under a server-made name (server/storage/uploads.ts). Retrying the same id and bytes answers the same.
import { z } from "zod";
import { json } from "@/server/http/respond";
import { parseInput, route } from "@/server/http/route";
import { receiveAttachment } from "@/server/storage/uploads";

export const dynamic = "force-dynamic";

export const POST = route({ access: "signed-in", surface: "attachment", body: "bytes" }, async ({ req, db, user }) => {
  const id = parseInput(z.uuid(), req.headers.get("x-rimelog-attachment-id"), {
    surface: "attachment",
    invalid: "The upload needs the attachment id the tablet made (a UUID).",
  });
  const { row, sha256, created } = await receiveAttachment(db, req, { id, uploadedBy: user.id });
  return json({ id: row.id, bytes: row.bytes, mime: row.mime, sha256 }, created ? 201 : 200);
});
