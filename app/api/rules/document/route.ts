// The facility's rules document. GET: the PDF in force, for anyone signed in (a download, like every
// stored file). POST (facility admin): upload a new one — checked by its first bytes and size with
// a clear message — stored, and put in force as an audited rules change.
import { createHash, randomUUID } from "node:crypto";
import { getDb } from "@/db";
import { getAttachment, saveAttachment } from "@/db/queries/attachments";
import { changeRules, requireRules } from "@/db/queries/rules";
import { env } from "@/lib/env";
import { AppError } from "@/lib/errors";
import { checkRulesDocument, RULES_DOCUMENT_MAX_BYTES } from "@/lib/safety/rules-document";
import { requireUser } from "@/server/auth/require";
import { handle, json } from "@/server/http/respond";
import { readUploadBytes, requireByteUpload, uploadHeader } from "@/server/http/upload";
import { cleanFileName, fileStore, newStorageKey } from "@/server/storage/objects";

export const dynamic = "force-dynamic";

export async function POST(req: Request) {
  return handle(async () => {
    const user = await requireUser("facility_admin");
    requireByteUpload(req, "rules_document");
    const fileName = uploadHeader(req, "x-rimelog-file-name").slice(0, 200) || "rules.pdf";
    // Refused early on the declared length; checkRulesDocument checks the bytes again (the header can lie).
    const bytes = await readUploadBytes(req, {
      surface: "rules_document",
      maxBytes: RULES_DOCUMENT_MAX_BYTES,
      tooLarge: (declared) =>
        `"${fileName}" is ${(declared / 1048576).toFixed(1)} MB; the limit is ${RULES_DOCUMENT_MAX_BYTES / 1048576} MB. Upload a smaller PDF.`,
    });
    const check = checkRulesDocument(bytes, fileName);
    if (!check.ok)
      throw new AppError(
        check.status === 413 ? "too_large" : check.status === 415 ? "unsupported" : "bad_request",
        "rules_document",
        check.message,
      );
    const db = await getDb();
    const current = await requireRules(db);
    const sha256 = createHash("sha256").update(bytes).digest("hex");
    const storageKey = newStorageKey();
    await fileStore(env().RIMELOG_STORAGE_DIR).put(storageKey, bytes);
    const { row } = await saveAttachment(db, {
      id: randomUUID(),
      fileName: cleanFileName(fileName, "pdf"),
      mime: "application/pdf",
      bytes: bytes.length,
      sha256,
      storageKey,
      uploadedBy: user.id,
    });
    const reason = uploadHeader(req, "x-rimelog-reason").trim() || `New rules document "${row.fileName}" uploaded.`;
    const rules = await changeRules(db, user, {
      values: current.values,
      reason,
      expectedVersion: current.version,
      documentAttachmentId: row.id,
    });
    return json({ rules }, 201);
  });
}

export async function GET() {
  return handle(async () => {
    await requireUser();
    const db = await getDb();
    const rules = await requireRules(db);
    if (!rules.document)
      throw new AppError("not_found", "rules_document", "The facility admin has not uploaded the rules document yet.");
    const row = await getAttachment(db, { id: rules.document.id });
    const bytes = row ? await fileStore(env().RIMELOG_STORAGE_DIR).get(row.storageKey) : null;
    if (!row || !bytes)
      throw new AppError(
        "not_found",
        "rules_document",
        "The rules document is missing from storage; ask the facility admin to upload it again.",
      );
    const ascii = row.fileName.replace(/[^\x20-\x7e]/g, "_").replace(/["\\]/g, "_");
    return new Response(bytes as unknown as BodyInit, {
      headers: {
        "Content-Type": "application/pdf",
        "Content-Length": String(bytes.length),
        "Content-Disposition": `attachment; filename="${ascii}"`,
        "X-Content-Type-Options": "nosniff",
        "Content-Security-Policy": "sandbox; default-src 'none'",
        "Cache-Control": "no-store",
      },
    });
  });
}
