// Which request paths are pages, which are public, and who may open each page: explicit path
// rules (never a file ending), read by proxy.ts for every request and walked by the access test.
// Pure; no I/O.
import type { Role } from "@/lib/schemas/user";

export type PageAccess = "public" | "signed-in" | readonly Role[];

/** Files and Next's own paths served to anyone (exact paths, or a folder's prefix ending in "/"). */
const PUBLIC_FILES = [
  "/sw.js",
  "/manifest.webmanifest",
  "/favicon.ico",
  "/icons/",
  "/_next/static/",
  "/_next/image",
  "/swe-worker-",
] as const;

const PUBLIC_PAGES = ["/signin", "/offline"] as const;

const ADMIN: readonly Role[] = ["facility_admin"];
const OFFICE: readonly Role[] = ["safety_officer", "facility_admin"];

/**
 * Pages for some roles only, by path prefix (a prefix covers its sub-paths). They match the
 * server components' own checks (app/(app)/_components/role-page.tsx and the admin layout).
 */
export const PAGE_ROLES: readonly { prefix: string; roles: readonly Role[] }[] = [
  { prefix: "/admin", roles: ADMIN },
  { prefix: "/audit", roles: OFFICE },
];

/** The page where a person whose password was reset must choose a new one. */
export const ACCOUNT_PAGE = "/account";

const under = (path: string, prefix: string) => path === prefix || path.startsWith(`${prefix}/`);

/** A public file (or one of Next's assets): no session needed, no page rules. */
export function isPublicFile(path: string): boolean {
  return PUBLIC_FILES.some((f) => (f.endsWith("/") || f.endsWith("-") ? path.startsWith(f) : path === f));
}

export function isApiPath(path: string): boolean {
  return under(path, "/api");
}

/** Who may open this page path. */
export function pageAccess(path: string): PageAccess {
  if (PUBLIC_PAGES.some((p) => under(path, p))) return "public";
  return PAGE_ROLES.find((r) => under(path, r.prefix))?.roles ?? "signed-in";
}

export function mayOpenPage(access: PageAccess, role: Role | null): boolean {
  if (access === "public") return true;
  if (!role) return false;
  return access === "signed-in" || access.includes(role);
}
