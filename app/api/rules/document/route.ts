// The facility's rules document. GET: the PDF in force, for anyone signed in (a download, like every
// stored file). POST (facility admin): upload a new one — checked by its first bytes and size with
// a clear message — stored, and put in force as an audited rules change.
import { changeRules, requireRules } from "@/db/queries/rules";
import { AppError } from "@/lib/errors";
import { checkRulesDocument, RULES_DOCUMENT_MAX_BYTES } from "@/lib/safety/rules-document";
import { downloadResponse } from "@/server/http/download";
import { json } from "@/server/http/respond";
import { route } from "@/server/http/route";
import { uploadHeader } from "@/server/http/upload";
import type { Sniffed } from "@/server/storage/objects";
import { readStoredFile, receiveUpload } from "@/server/storage/uploads";

export const dynamic = "force-dynamic";

const REFUSAL = { 413: "too_large", 415: "unsupported", 400: "bad_request" } as const;
const PDF: Sniffed = { mime: "application/pdf", ext: "pdf" };
const MB = 1048576;

export const POST = route(
  { access: ["facility_admin"], surface: "rules_document", body: "bytes" },
  async ({ req, db, user }) => {
    const fileName = uploadHeader(req, "x-rimelog-file-name").slice(0, 200) || "rules.pdf";
    const current = await requireRules(db);
    // Refused early on the declared length; checkRulesDocument checks the bytes again (the header can lie).
    const { row } = await receiveUpload(db, req, {
      surface: "rules_document",
      fileName,
      uploadedBy: user.id,
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
    return json({ rules: await changeRules(db, user, change) }, 201);
  },
);

export const GET = route({ access: "signed-in", surface: "rules_document" }, async ({ db }) => {
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
  return downloadResponse(file.bytes, { type: "application/pdf", fileName: file.row.fileName, sandbox: true });
});
