// Page protection: a request for a page without a session goes to the sign-in page.
// API routes answer 401/403 themselves (server/auth/require.ts); static assets pass.

import { type NextRequest, NextResponse } from "next/server";
import { getToken } from "next-auth/jwt";

const PUBLIC_PAGES = ["/signin", "/offline"];

export async function proxy(req: NextRequest) {
  const { pathname, search } = req.nextUrl;
  if (PUBLIC_PAGES.some((p) => pathname === p || pathname.startsWith(`${p}/`))) return NextResponse.next();
  const token = await getToken({ req, secret: process.env.AUTH_SECRET ?? process.env.NEXTAUTH_SECRET });
  if (token) return NextResponse.next();
  const url = req.nextUrl.clone();
  url.pathname = "/signin";
  url.search = pathname === "/" ? "" : `?next=${encodeURIComponent(pathname + search)}`;
  return NextResponse.redirect(url);
}

export const config = {
  // Everything but the API, Next's assets, the service worker, the manifest and static files.
  matcher: [
    "/((?!api|_next|sw\\.js|swe-worker|manifest\\.webmanifest|favicon|icons|fonts|.*\\.(?:png|svg|ico|woff2?|js|css|map)$).*)",
  ],
};
