// GET /api/attachments/:id — a stored file for any signed-in user, always as a download
// (Content-Disposition: attachment), with its sniffed type, nosniff and a sandboxing CSP.
import { z } from "zod";
import { AppError } from "@/lib/errors";
import { downloadResponse } from "@/server/http/download";
import { route } from "@/server/http/route";
import { readStoredFile } from "@/server/storage/uploads";

export const dynamic = "force-dynamic";

export const GET = route(
  {
    access: "signed-in",
    surface: "attachment",
    params: z.object({ id: z.uuid() }),
    invalid: { type: "not_found", message: "No such file." },
  },
  async ({ db, params }) => {
    const file = await readStoredFile(db, params.id);
    if (!file) throw new AppError("not_found", "attachment", "No such file.");
    if (!file.bytes)
      throw new AppError("not_found", "attachment", "The file is missing from storage; restore it from a backup.");
    return downloadResponse(file.bytes, { type: file.row.mime, fileName: file.row.fileName, sandbox: true });
  },
);
