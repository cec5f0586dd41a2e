// The facility's rules document: a new upload (checked by its first bytes and size, with a
// message an admin can act on) is stored and put in force as an audited rules change; the one in
// force is read back for the download.
import "server-only";
import type { Db } from "@/db";
import { changeRules, requireRules } from "@/db/queries/rules";
import { AppError } from "@/lib/errors";
import { checkRulesDocument, RULES_DOCUMENT_MAX_BYTES } from "@/lib/safety/rules-document";
import type { SessionUser } from "@/lib/schemas/user";
import { uploadHeader } from "@/server/http/upload";
import type { Sniffed } from "@/server/storage/objects";
import { readStoredFile, receiveUpload } from "@/server/storage/uploads";

const REFUSAL = { 413: "too_large", 415: "unsupported", 400: "bad_request" } as const;
const PDF: Sniffed = { mime: "application/pdf", ext: "pdf" };
const MB = 1048576;

/** Store the uploaded PDF and put it in force (same rule values, a new version); answers the rules. */
export async function putRulesDocumentInForce(db: Db, admin: SessionUser, req: Request) {
  const fileName = uploadHeader(req, "x-rimelog-file-name").slice(0, 200) || "rules.pdf";
  const current = await requireRules(db);
  // Refused early on the declared length; checkRulesDocument checks the bytes again (the header can lie).
  const { row } = await receiveUpload(db, req, {
    surface: "rules_document",
    fileName,
    uploadedBy: admin.id,
    maxBytes: RULES_DOCUMENT_MAX_BYTES,
    tooLarge: (declared) =>
      `"${fileName}" is ${(declared / MB).toFixed(1)} MB; the limit is ${RULES_DOCUMENT_MAX_BYTES / MB} MB. Upload a smaller PDF.`,
    identify: (bytes) => {
      const check = checkRulesDocument(bytes, fileName);
      if (!check.ok) throw new AppError(REFUSAL[check.status], "rules_document", check.message);
      return PDF;
    },
  });
  const reason = uploadHeader(req, "x-rimelog-reason").trim() || `New rules document "${row.fileName}" uploaded.`;
  const change = { values: current.values, reason, expectedVersion: current.version, documentAttachmentId: row.id };
  return changeRules(db, admin, change);
}

/** The rules document in force: its stored name and bytes. */
export async function rulesDocumentInForce(db: Db): Promise<{ fileName: string; bytes: Uint8Array }> {
  const rules = await requireRules(db);
  if (!rules.document)
    throw new AppError("not_found", "rules_document", "The facility admin has not uploaded the rules document yet.");
  const file = await readStoredFile(db, rules.document.id);
  if (!file?.bytes)
    throw new AppError(
      "not_found",
      "rules_document",
      "The rules document is missing from storage; ask the facility admin to upload it again.",
    );
  return { fileName: file.row.fileName, bytes: file.bytes };
}
