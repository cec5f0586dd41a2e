// Reading a raw-bytes upload (a file sent as application/octet-stream by Rimelog's own pages):
// the same-origin check (an Origin header is required: a cross-site form cannot send raw bytes
// with it), the content type, text headers sent URI-encoded, and an early refusal on the declared
// length before the body is read. What the bytes must be is the caller's check.
import "server-only";
import { AppError } from "@/lib/errors";
import { isSameOrigin } from "./respond";

/** Refuse a request whose Origin is missing or not this server's own host. */
export function requireSameOrigin(req: Request): void {
  if (!isSameOrigin(req))
    throw new AppError("forbidden", "origin", "Uploads are accepted only from Rimelog's own pages.");
}

/** Same origin, and the body sent as application/octet-stream. */
export function requireByteUpload(req: Request, surface: string): void {
  requireSameOrigin(req);
  if ((req.headers.get("content-type") ?? "").toLowerCase() !== "application/octet-stream") {
    throw new AppError("unsupported", surface, "Send the file as application/octet-stream.");
  }
}

/** A header the page sent URI-encoded (file names, reasons); "" when absent or malformed. */
export function uploadHeader(req: Request, name: string): string {
  try {
    return decodeURIComponent(req.headers.get(name) ?? "");
  } catch {
    return "";
  }
}

/**
 * The body's bytes, refused early when the declared length is over `maxBytes` (with the caller's
 * message). The header can lie: the caller checks the length of what arrived again.
 */
export async function readUploadBytes(
  req: Request,
  opts: { surface: string; maxBytes: number; tooLarge: (declaredBytes: number) => string },
): Promise<Uint8Array> {
  const declared = Number(req.headers.get("content-length") ?? "0");
  if (declared > opts.maxBytes) throw new AppError("too_large", opts.surface, opts.tooLarge(declared));
  return new Uint8Array(await req.arrayBuffer());
}
