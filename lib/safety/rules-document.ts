// The facility's own rules document: a PDF, checked by its first bytes (not by the name or the
// type the browser claims) and by size, with messages an admin can act on.
export const RULES_DOCUMENT_MAX_BYTES = 10 * 1024 * 1024;

export type DocumentCheck = { ok: true } | { ok: false; status: 413 | 415 | 400; message: string };

const PDF_MAGIC = [0x25, 0x50, 0x44, 0x46, 0x2d]; // "%PDF-"

export function isPdf(bytes: Uint8Array): boolean {
  // The PDF specification allows the header within the first 1024 bytes.
  const limit = Math.min(bytes.length - PDF_MAGIC.length, 1024);
  for (let start = 0; start <= limit; start++) {
    if (PDF_MAGIC.every((b, i) => bytes[start + i] === b)) return true;
  }
  return false;
}

function mb(bytes: number): string {
  return `${Number((bytes / 1024 / 1024).toFixed(1))} MB`;
}

export function checkRulesDocument(
  bytes: Uint8Array,
  fileName: string,
  maxBytes = RULES_DOCUMENT_MAX_BYTES,
): DocumentCheck {
  if (bytes.length === 0)
    return { ok: false, status: 400, message: `"${fileName}" is empty. Choose the facility's rules document (a PDF).` };
  if (bytes.length > maxBytes) {
    return {
      ok: false,
      status: 413,
      message: `"${fileName}" is ${mb(bytes.length)}; the limit is ${mb(maxBytes)}. Upload a smaller PDF (for example, without scanned images at full resolution).`,
    };
  }
  if (!isPdf(bytes)) {
    return {
      ok: false,
      status: 415,
      message: `"${fileName}" is not a PDF (its content does not start like one). Save or export the rules document as PDF and upload that.`,
    };
  }
  return { ok: true };
}
