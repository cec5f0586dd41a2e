// GET /api/attachments/:id — a stored file for any signed-in user, always as a download
// (Content-Disposition: attachment), with its sniffed type, nosniff and a sandboxing CSP.
import { z } from "zod";
import { getDb } from "@/db";
import { getAttachment } from "@/db/queries/attachments";
import { env } from "@/lib/env";
import { AppError } from "@/lib/errors";
import { requireUser } from "@/server/auth/require";
import { handle } from "@/server/http/respond";
import { fileStore } from "@/server/storage/objects";

export const dynamic = "force-dynamic";

export async function GET(_req: Request, ctx: { params: Promise<{ id: string }> }) {
  return handle(async () => {
    await requireUser();
    const id = z.uuid().safeParse((await ctx.params).id);
    if (!id.success) throw new AppError("not_found", "attachment", "No such file.");
    const row = await getAttachment(await getDb(), { id: id.data });
    if (!row) throw new AppError("not_found", "attachment", "No such file.");
    const bytes = await fileStore(env().RIMELOG_STORAGE_DIR).get(row.storageKey);
    if (!bytes)
      throw new AppError("not_found", "attachment", "The file is missing from storage; restore it from a backup.");
    const ascii = row.fileName.replace(/[^\x20-\x7e]/g, "_").replace(/["\\]/g, "_");
    return new Response(bytes as unknown as BodyInit, {
      headers: {
        "Content-Type": row.mime,
        "Content-Length": String(bytes.length),
        "Content-Disposition": `attachment; filename="${ascii}"; filename*=UTF-8''${encodeURIComponent(row.fileName)}`,
        "X-Content-Type-Options": "nosniff",
        "Content-Security-Policy": "sandbox; default-src 'none'",
        "Cache-Control": "no-store",
      },
    });
  });
}
