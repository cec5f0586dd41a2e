// Access control across every route handler. Each route file under app/api is found on disk (so a
// new route is covered without editing this file); every method it exports carries its declared
// access (server/http/route.ts); each is called signed out and as each role, and the answer must
// match the declaration: 401 signed out, 403 for a role not declared, neither for a declared role
// (nor for anyone on a public route). The declarations themselves are pinned in ACCESS below, so
// widening or narrowing a route's roles is a visible change here too.
// next-auth's session look-up and the server database are replaced by test doubles.
import { mkdtempSync, readdirSync, rmSync, statSync } from "node:fs";
import { tmpdir } from "node:os";
import { join, relative } from "node:path";
import { NextRequest } from "next/server";
import { encode } from "next-auth/jwt";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import type { Db } from "@/db/client";
import { DEMO_USERS } from "@/db/seed";
import { mayOpenPage, type PageAccess, pageAccess } from "@/lib/auth/pages";
import { ROLES } from "@/lib/schemas/user";
import { openSession } from "@/server/auth/sessions";
import type { Access } from "@/server/http/route";
import { freshDb } from "./fixture";

// Chain signing and stored files write under these (settings are read lazily, at the first request).
const dirs = ["keys", "files"].map((name) => mkdtempSync(join(tmpdir(), `rimelog-access-${name}-`)));
process.env.RIMELOG_KEY_DIR = dirs[0];
process.env.RIMELOG_STORAGE_DIR = dirs[1];

const session = vi.hoisted(() => ({
  current: null as null | { user: { id: string; name: string; email: string; role: string }; sv: number; sid: string },
}));
const database = vi.hoisted(() => ({ db: null as unknown }));
vi.mock("next-auth", async (orig) => ({ ...(await orig<object>()), getServerSession: async () => session.current }));
vi.mock("@/db", () => ({ getDb: async () => database.db }));

const METHODS = ["GET", "POST", "PUT", "PATCH", "DELETE"] as const;
type Method = (typeof METHODS)[number];
type Handler = ((req: Request, ctx?: unknown) => Promise<Response>) & { access?: Access };

/**
 * Route files not made with the route wrapper, and the access they have: next-auth's own handler,
 * public by nature, not called here.
 */
const UNWRAPPED: Record<string, { access: Access; call: boolean }> = {
  "app/api/auth/[...nextauth]/route.ts": { access: "public", call: false },
};

const OFFICE = ["safety_officer", "facility_admin"] as const;
/** Who may call what, reviewed: a change of a route's roles changes this table too. */
const ACCESS: Record<string, Access> = {
  "POST /api/account/password": "signed-in",
  "GET /api/attachments/[id]": "signed-in",
  "POST /api/attachments": "signed-in",
  "POST /api/audit/findings": ["safety_officer"],
  "GET /api/audit/queue": OFFICE,
  "GET /api/audit/records/[id]": OFFICE,
  "GET /api/audit/transfers": OFFICE,
  "GET /api/auth/[...nextauth]": "public",
  "POST /api/auth/[...nextauth]": "public",
  "GET /api/calibrations": "signed-in",
  "POST /api/calibrations": ["facility_admin", "technician"],
  "GET /api/chain": OFFICE,
  "POST /api/chain": OFFICE,
  "GET /api/cryostats": "signed-in",
  "GET /api/devices": ["facility_admin"],
  "POST /api/devices": "signed-in",
  "POST /api/devices/[id]/revoke": ["facility_admin"],
  "GET /api/cryostats/[id]/entries": "signed-in",
  "GET /api/cryostats/[id]/series": "signed-in",
  "GET /api/exports/report": OFFICE,
  "GET /api/exports/transfers": OFFICE,
  "GET /api/health": "public",
  "GET /api/mail": ["facility_admin"],
  "GET /api/me": "signed-in",
  "POST /api/pin": "signed-in",
  "GET /api/pin": "signed-in",
  "POST /api/pin/confirm": "signed-in",
  "GET /api/rules": "signed-in",
  "PUT /api/rules": ["facility_admin"],
  "GET /api/rules/document": "signed-in",
  "POST /api/rules/document": ["facility_admin"],
  "GET /api/runs": "signed-in",
  "GET /api/sync/pull": "signed-in",
  "POST /api/sync/push": "signed-in",
  "GET /api/templates": "signed-in",
  "POST /api/templates": ["facility_admin"],
  "PATCH /api/users/[id]": ["facility_admin"],
  "POST /api/users/[id]/password": ["facility_admin"],
  "POST /api/users/[id]/sessions": ["facility_admin"],
  "GET /api/users": ["facility_admin"],
  "POST /api/users": ["facility_admin"],
};

function routeFiles(dir = "app/api"): string[] {
  return readdirSync(dir).flatMap((name) => {
    const p = join(dir, name);
    return statSync(p).isDirectory() ? routeFiles(p) : name === "route.ts" ? [relative(process.cwd(), p)] : [];
  });
}

const urlPath = (file: string) => `/${file.replace(/^app\//, "").replace(/\/route\.ts$/, "")}`;

type RouteMethod = { file: string; method: Method; key: string; handler: Handler; access: Access; call: boolean };

async function routeMethods(): Promise<RouteMethod[]> {
  const out: RouteMethod[] = [];
  for (const file of routeFiles()) {
    const mod = (await import(`@/${file}`)) as Record<string, unknown>;
    for (const method of METHODS) {
      const handler = mod[method] as Handler | undefined;
      if (typeof handler !== "function") continue;
      const fallback = UNWRAPPED[file];
      const access = handler.access ?? fallback?.access;
      if (!access) throw new Error(`${method} ${file} declares no access: make it with route() (server/http/route.ts)`);
      out.push({ file, method, key: `${method} ${urlPath(file)}`, handler, access, call: fallback?.call ?? true });
    }
  }
  return out;
}

/** The route's dynamic segments ([id], [...rest]), each given the same harmless value. */
function paramsOf(file: string): Record<string, string | string[]> {
  const segments = [...file.matchAll(/\[(\.\.\.)?([^\]]+)\]/g)];
  return Object.fromEntries(segments.map(([, rest, name]) => [name, rest ? ["heron"] : "heron"]));
}

function call(r: RouteMethod, url = "http://localhost:3000/api/x") {
  const init: RequestInit = {
    method: r.method,
    headers: { host: "localhost:3000", "content-type": "application/json", origin: "http://localhost:3000" },
  };
  if (r.method !== "GET") init.body = "{}";
  return r.handler(new Request(url, init), { params: Promise.resolve(paramsOf(r.file)) });
}

/** One live server-side session per person (sessions table), opened on first use. */
const openSessions = new Map<string, string>();
async function signIn(id: string | null) {
  const u = DEMO_USERS.find((x) => x.id === id);
  if (!u) {
    session.current = null;
    return;
  }
  let sid = openSessions.get(u.id);
  if (!sid) {
    sid = (await openSession(database.db as Db, { userId: u.id })).id;
    openSessions.set(u.id, sid);
  }
  session.current = { user: { id: u.id, name: u.name, email: u.email, role: u.role }, sv: 1, sid };
}

/** What the declaration says a caller gets: 401, 403, or an answer past the access check. */
function expected(access: Access, role: string | null): "401" | "403" | "allowed" {
  if (access === "public") return "allowed";
  if (role === null) return "401";
  if (access === "signed-in") return "allowed";
  return (access as readonly string[]).includes(role) ? "allowed" : "403";
}

const seen = (status: number) => (status === 401 || status === 403 ? String(status) : "allowed");

let routes: RouteMethod[] = [];
beforeAll(async () => {
  database.db = (await freshDb({ seeded: true })) as Db;
  routes = await routeMethods();
}, 60_000);
afterAll(() => {
  for (const d of dirs) rmSync(d, { recursive: true, force: true });
});

describe("every API route declares who may call it", () => {
  it("finds the route handlers on disk, each method with its declared access", () => {
    expect(routes.length).toBeGreaterThanOrEqual(30);
    const wrapped = routes.filter((r) => !(r.file in UNWRAPPED));
    for (const r of wrapped) expect(`${r.key} ${typeof r.handler.access}`).not.toBe(`${r.key} undefined`);
  });

  it("the declarations are the reviewed access table", () => {
    const declared = Object.fromEntries(routes.map((r) => [r.key, r.access]));
    expect(declared).toEqual(ACCESS);
  });
});

describe("every API route × method × role answers as declared", () => {
  const callers: { label: string; userId: string | null; role: string | null }[] = [
    { label: "signed out", userId: null, role: null },
    ...ROLES.map((role) => {
      const u = DEMO_USERS.find((x) => x.role === role);
      if (!u) throw new Error(`no demo user with role ${role}`);
      return { label: role, userId: u.id, role };
    }),
  ];
  for (const caller of callers) {
    it(`${caller.label}`, async () => {
      const answers: string[] = [];
      const wanted: string[] = [];
      for (const r of routes.filter((x) => x.call)) {
        await signIn(caller.userId);
        const res = await call(r);
        answers.push(`${r.key}: ${seen(res.status)}`);
        wanted.push(`${r.key}: ${expected(r.access, caller.role)}`);
      }
      expect(answers).toEqual(wanted);
    }, 60_000);
  }
});

describe("role-restricted routes", () => {
  const cases: { file: string; method: Method; allowed: string[] }[] = [
    { file: "app/api/users/route.ts", method: "GET", allowed: ["u-ines"] },
    { file: "app/api/devices/route.ts", method: "GET", allowed: ["u-ines"] },
  ];
  for (const c of cases) {
    it(`${c.method} ${c.file}: only ${c.allowed.join(", ")}`, async () => {
      const r = routes.find((x) => x.file === c.file && x.method === c.method);
      expect(r).toBeDefined();
      for (const u of DEMO_USERS) {
        await signIn(u.id);
        const res = await call(r!);
        expect(`${u.id} ${res.status}`).toBe(`${u.id} ${c.allowed.includes(u.id) ? 200 : 403}`);
      }
    });
  }

  it("POST /api/users: a technician is refused and nobody is added", async () => {
    const mod = await import("@/app/api/users/route");
    await signIn("u-tomasz");
    const res = await mod.POST(
      new Request("http://localhost:3000/api/users", {
        method: "POST",
        headers: { host: "localhost:3000", "content-type": "application/json" },
        body: JSON.stringify({
          name: "Mallory Test",
          email: "m@x.example",
          role: "facility_admin",
          password: "0123456789",
        }),
      }),
    );
    expect(res.status).toBe(403);
    await signIn("u-ines");
    const list = (await (await mod.GET(new Request("http://localhost:3000/api/users"))).json()) as {
      users: { email: string }[];
    };
    expect(list.users.map((u) => u.email)).not.toContain("m@x.example");
  });

  it("a session whose version is stale (role changed, user disabled) counts as signed out", async () => {
    const mod = await import("@/app/api/me/route");
    await signIn("u-tomasz");
    session.current!.sv = 0;
    expect((await mod.GET(new Request("http://localhost:3000/api/me"))).status).toBe(401);
  });
});

describe("malformed ids and dates answer 400 or 404, never 500, on every route", () => {
  const BAD = ["-".repeat(36), "\u0000", "%00", "x".repeat(500), "../../etc/passwd", "' OR 1=1 --", "0000-01-01"];
  const QUERY = ["id", "cryostatId", "cryostat", "person", "from", "to", "since", "cursor", "chain", "ref", "limit"];
  it("each route, as a role it admits, with each malformed value in its address and its query", async () => {
    const answers: string[] = [];
    for (const r of routes.filter((x) => x.call)) {
      const role = r.access === "public" || r.access === "signed-in" ? "facility_admin" : r.access[0];
      const u = DEMO_USERS.find((x) => x.role === role)!;
      for (const bad of BAD) {
        await signIn(u.id);
        const q = new URLSearchParams(QUERY.map((k) => [k, bad])).toString();
        const params = Object.fromEntries(Object.keys(paramsOf(r.file)).map((k) => [k, bad]));
        const init: RequestInit = {
          method: r.method,
          headers: { host: "localhost:3000", "content-type": "application/json", origin: "http://localhost:3000" },
        };
        if (r.method !== "GET") init.body = "{}";
        const res = await r.handler(new Request(`http://localhost:3000/api/x?${q}`, init), {
          params: Promise.resolve(params),
        });
        if (res.status >= 500) answers.push(`${r.key} ${JSON.stringify(bad)}: ${res.status}`);
      }
    }
    expect(answers).toEqual([]);
  }, 120_000);

  it("the four addresses from the issue", async () => {
    await signIn("u-ines");
    const records = await import("@/app/api/audit/records/[id]/route");
    const report = await import("@/app/api/exports/report/route");
    const series = await import("@/app/api/cryostats/[id]/series/route");
    const runs = await import("@/app/api/runs/route");
    const at = (path: string) => new Request(`http://localhost:3000${path}`, { headers: { host: "localhost:3000" } });
    const ctx = (id: string) => ({ params: Promise.resolve({ id }) });
    const statuses = [
      (await records.GET(at(`/api/audit/records/${"-".repeat(36)}`), ctx("-".repeat(36)))).status,
      (await report.GET(at("/api/exports/report?from=0000-01-01&to=0000-01-02"))).status,
      (await series.GET(at("/api/cryostats/%00/series"), ctx("\u0000"))).status,
      (await runs.GET(at("/api/runs?cryostatId=%00"))).status,
    ];
    for (const s of statuses) expect([400, 404]).toContain(s);
  });
});

/** Pages on disk (every page.tsx under app/) as paths: route groups dropped, each [segment] given "heron". */
function pageFiles(dir = "app"): string[] {
  return readdirSync(dir).flatMap((name) => {
    const p = join(dir, name);
    return statSync(p).isDirectory() ? pageFiles(p) : name === "page.tsx" ? [relative(process.cwd(), p)] : [];
  });
}
const pagePath = (file: string) =>
  `/${file
    .replace(/^app\//, "")
    .replace(/(^|\/)page\.tsx$/, "")
    .split("/")
    .filter((seg) => seg && !/^\(.*\)$/.test(seg))
    .map((seg) => (/^\[.*\]$/.test(seg) ? "heron" : seg))
    .join("/")}`;

/** Who may open which page, reviewed: a change of a page's roles changes this table too. */
const PAGES: Record<string, PageAccess> = {
  "/": "signed-in",
  "/account": "signed-in",
  "/admin/devices": ["facility_admin"],
  "/admin/mail": ["facility_admin"],
  "/admin/rules": ["facility_admin"],
  "/admin/templates": ["facility_admin"],
  "/admin/users": ["facility_admin"],
  "/audit": OFFICE,
  "/audit/heron": OFFICE,
  "/calc": "signed-in",
  "/calibrations": "signed-in",
  "/cryostats/heron": "signed-in",
  "/handover": "signed-in",
  "/offline": "public",
  "/procedures": "signed-in",
  "/quench/new": "signed-in",
  "/runs": "signed-in",
  "/signin": "public",
  "/transfers/new": "signed-in",
};

describe("every page × role", () => {
  const paths = pageFiles().map(pagePath).sort();
  const SECRET = "test-secret-for-the-page-walk-0123456789";

  it("finds the pages on disk, and their rules (lib/auth/pages.ts) are the reviewed table", () => {
    expect(paths.length).toBeGreaterThanOrEqual(15);
    expect(Object.fromEntries(paths.map((p) => [p, pageAccess(p)]))).toEqual(PAGES);
  });

  it("the proxy answers each page as declared: signed out → sign-in, other roles → 403, allowed → the page", async () => {
    process.env.AUTH_SECRET = SECRET;
    const { proxy } = await import("@/proxy");
    const answers: string[] = [];
    const wanted: string[] = [];
    for (const role of [null, ...ROLES]) {
      const cookie = role
        ? `next-auth.session-token=${await encode({ token: { uid: "u", sid: "s", sv: 1, aexp: 0, role }, secret: SECRET })}`
        : undefined;
      for (const path of paths) {
        const res = await proxy(new NextRequest(`http://localhost:3000${path}`, { headers: cookie ? { cookie } : {} }));
        const to = res.headers.get("location");
        answers.push(`${role} ${path}: ${res.status === 307 && to ? new URL(to).pathname : res.status}`);
        const access = PAGES[path]!;
        wanted.push(`${role} ${path}: ${mayOpenPage(access, role) ? 200 : role ? 403 : "/signin"}`);
      }
    }
    expect(answers).toEqual(wanted);
  });

  it("the server components gate the admin and audit pages by role too (not only the proxy)", async () => {
    const { default: AdminLayout } = await import("@/app/(app)/admin/layout");
    const { RolePage } = await import("@/app/(app)/_components/role-page");
    const { NotAllowed } = await import("@/components/shell/not-allowed");
    const gated = ["/admin/devices", "/admin/mail", "/admin/rules", "/admin/templates", "/admin/users", "/audit"];
    for (const u of DEMO_USERS) {
      await signIn(u.id);
      const inLayout = await AdminLayout({ children: "admin screen" });
      expect(`${u.id} ${inLayout === "admin screen"}`).toBe(`${u.id} ${u.role === "facility_admin"}`);
      for (const path of gated) {
        const file = pageFiles().find((f) => pagePath(f) === path)!;
        const Page = (await import(`@/${file}`)).default as (p: object) => unknown;
        // A page made with rolePage() renders <RolePage/>: evaluate that too.
        let shown = (await Page({ params: Promise.resolve({}), searchParams: Promise.resolve({}) })) as {
          type?: unknown;
          props: Parameters<typeof RolePage>[0];
        };
        if (shown.type === RolePage) shown = (await RolePage(shown.props)) as typeof shown;
        const allowed = mayOpenPage(PAGES[path]!, u.role);
        expect(`${u.id} ${path} ${shown.type === NotAllowed ? "not allowed" : "shown"}`).toBe(
          `${u.id} ${path} ${allowed ? "shown" : "not allowed"}`,
        );
      }
    }
  });
});

describe("the access table itself", () => {
  it("has no entry for a route that is gone", () => {
    const keys = new Set(routes.map((r) => r.key));
    expect(Object.keys(ACCESS).filter((k) => !keys.has(k))).toEqual([]);
  });
});
