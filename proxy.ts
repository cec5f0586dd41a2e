// Every request passes here (Next 16's proxy, formerly middleware). By explicit path rules
// (lib/auth/pages.ts), never by file ending:
// - public files and Next's assets pass; API routes pass (they answer 401/403 themselves,
//   server/http/route.ts, and set their own headers, a download's sandbox CSP included);
// - a page without a session goes to the sign-in page (with a same-origin `next`); a page for
//   other roles answers 403; after an admin's password reset every page leads to My account;
// - every page gets a Content-Security-Policy with a fresh nonce for its scripts (Next's
//   documented nonce pattern: the nonce travels to the render in the request's headers, and
//   app/layout.tsx puts it on its one inline script), no 'unsafe-inline' for scripts;
// - with an https public URL (NEXTAUTH_URL, else the request), Strict-Transport-Security.
// The session itself (ended, expired) is checked by the server on every API call and by the
// server components that gate pages; here the token's signature and expiry are checked.

import { type NextRequest, NextResponse } from "next/server";
import { getToken } from "next-auth/jwt";
import { ACCOUNT_PAGE, isApiPath, isPublicFile, mayOpenPage, pageAccess } from "@/lib/auth/pages";
import type { Role } from "@/lib/schemas/user";

const HSTS = "max-age=63072000; includeSubDomains";

export function contentSecurityPolicy(nonce: string, dev = process.env.NODE_ENV === "development"): string {
  return [
    "default-src 'self'",
    `script-src 'self' 'nonce-${nonce}' 'strict-dynamic'${dev ? " 'unsafe-eval'" : ""}`,
    "style-src 'self' 'unsafe-inline'",
    "img-src 'self' data: blob:",
    "font-src 'self'",
    "connect-src 'self'",
    "worker-src 'self'",
    "manifest-src 'self'",
    "object-src 'none'",
    "base-uri 'none'",
    "frame-ancestors 'none'",
    "form-action 'self'",
  ].join("; ");
}

function isHttps(req: NextRequest): boolean {
  const publicUrl = process.env.NEXTAUTH_URL;
  if (publicUrl) return publicUrl.startsWith("https://");
  return req.nextUrl.protocol === "https:" || req.headers.get("x-forwarded-proto") === "https";
}

function withHsts(req: NextRequest, res: NextResponse): NextResponse {
  if (isHttps(req)) res.headers.set("Strict-Transport-Security", HSTS);
  return res;
}

const NOT_ALLOWED_HTML = `<!doctype html><html lang="en-GB"><meta charset="utf-8"><title>Not allowed · Rimelog</title>
<body style="font-family:system-ui,sans-serif;max-width:36rem;margin:4rem auto;padding:0 1rem">
<h1>Not allowed</h1><p>This page is for other roles. Your role does not include it; ask the facility admin if you need it.</p>
<p><a href="/">Back to the room</a></p></body></html>`;

export async function proxy(req: NextRequest) {
  const { pathname, search } = req.nextUrl;
  if (isPublicFile(pathname) || isApiPath(pathname)) return withHsts(req, NextResponse.next());

  const nonce = Buffer.from(crypto.getRandomValues(new Uint8Array(16))).toString("base64");
  const csp = contentSecurityPolicy(nonce);
  const page = (res: NextResponse) => {
    res.headers.set("Content-Security-Policy", csp);
    return withHsts(req, res);
  };

  const access = pageAccess(pathname);
  if (access !== "public") {
    const token = await getToken({ req, secret: process.env.AUTH_SECRET ?? process.env.NEXTAUTH_SECRET });
    if (!token) {
      const url = req.nextUrl.clone();
      url.pathname = "/signin";
      url.search = pathname === "/" ? "" : `?next=${encodeURIComponent(pathname + search)}`;
      return page(NextResponse.redirect(url));
    }
    if (token.mc && pathname !== ACCOUNT_PAGE) {
      const url = req.nextUrl.clone();
      url.pathname = ACCOUNT_PAGE;
      url.search = "?reset=1";
      return page(NextResponse.redirect(url));
    }
    if (!mayOpenPage(access, (token.role as Role | undefined) ?? null)) {
      return page(
        new NextResponse(NOT_ALLOWED_HTML, { status: 403, headers: { "Content-Type": "text/html; charset=utf-8" } }),
      );
    }
  }

  const requestHeaders = new Headers(req.headers);
  requestHeaders.set("x-nonce", nonce);
  requestHeaders.set("Content-Security-Policy", csp);
  return page(NextResponse.next({ request: { headers: requestHeaders } }));
}

export const config = {
  // Every path but Next's build assets (the function sorts the rest by explicit rules).
  matcher: ["/((?!_next/static/|_next/image).*)"],
};
