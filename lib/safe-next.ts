// Where to go after signing in: the `next` query parameter, kept only as a path on this site.
// Resolved the way a browser resolves it (the WHATWG URL parser drops tabs and newlines and reads
// "\" as "/"), so "/\example.org/", "/<tab>/example.org/" and "//example.org" cannot leave the
// origin. Pure; used by the sign-in form.

const BASE = "https://rimelog.invalid";

/** A same-origin path (with query and fragment) to go to, or "/" when `next` is missing or leaves the site. */
export function safeNextPath(next: string | null | undefined): string {
  if (!next?.startsWith("/")) return "/";
  let url: URL;
  try {
    url = new URL(next, BASE);
  } catch {
    return "/";
  }
  if (url.origin !== BASE) return "/";
  const path = `${url.pathname}${url.search}${url.hash}`;
  // "/.//x" resolves to the path "//x", which a browser would read as another host.
  if (!path.startsWith("/") || path.startsWith("//") || path.startsWith("/\\")) return "/";
  return new URL(path, BASE).origin === BASE ? path : "/";
}
