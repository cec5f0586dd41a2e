// The one place download headers are made: every stored file and export leaves as an attachment
// (never shown inline), with its content type, a file name in both forms of RFC 6266, never
// cached, never sniffed, and, for stored files, a sandboxing Content-Security-Policy.
import "server-only";

/** RFC 5987 attr-char is narrower than what encodeURIComponent leaves alone: encode ' ( ) * too. */
function extValue(name: string): string {
  return encodeURIComponent(name).replace(/['()*]/g, (c) => `%${c.charCodeAt(0).toString(16).toUpperCase()}`);
}

/**
 * `attachment; filename="…"; filename*=UTF-8''…` (RFC 6266 section 4.3): the quoted name is plain
 * printable ASCII (anything else, quotes and backslashes become "_", and so does a "%" that could
 * read as an escape, RFC 6266 appendix D); `filename*` carries the real name, UTF-8 per RFC 5987.
 */
export function contentDisposition(fileName: string): string {
  const name = fileName || "download";
  const ascii = name
    .replace(/[^\x20-\x7e]/g, "_")
    .replace(/["\\]/g, "_")
    .replace(/%(?=[0-9A-Fa-f]{2})/g, "_");
  return `attachment; filename="${ascii}"; filename*=UTF-8''${extValue(name)}`;
}

export type DownloadOptions = {
  /** The Content-Type sent (for stored files, the type sniffed from their bytes at upload). */
  type: string;
  fileName: string;
  /** Add `Content-Security-Policy: sandbox; default-src 'none'` (stored files a user uploaded). */
  sandbox?: boolean;
};

export function downloadResponse(body: Uint8Array | string, opts: DownloadOptions): Response {
  const headers = new Headers({
    "Content-Type": opts.type,
    "Content-Disposition": contentDisposition(opts.fileName),
    "X-Content-Type-Options": "nosniff",
    "Cache-Control": "no-store",
  });
  if (typeof body !== "string") headers.set("Content-Length", String(body.byteLength));
  if (opts.sandbox) headers.set("Content-Security-Policy", "sandbox; default-src 'none'");
  return new Response(body as unknown as BodyInit, { headers });
}
