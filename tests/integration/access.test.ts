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
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import type { Db } from "@/db/client";
import { DEMO_USERS } from "@/db/seed";
import { ROLES } from "@/lib/schemas/user";
import type { Access } from "@/server/http/route";
import { freshDb } from "./fixture";

// Chain signing and stored files write under these (settings are read lazily, at the first request).
const dirs = ["keys", "files"].map((name) => mkdtempSync(join(tmpdir(), `rimelog-access-${name}-`)));
process.env.RIMELOG_KEY_DIR = dirs[0];
process.env.RIMELOG_STORAGE_DIR = dirs[1];

const session = vi.hoisted(() => ({
  current: null as null | { user: { id: string; name: string; email: string; role: string }; sv: number },
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

function signIn(id: string | null) {
  const u = DEMO_USERS.find((x) => x.id === id);
  session.current = u ? { user: { id: u.id, name: u.name, email: u.email, role: u.role }, sv: 1 } : null;
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
        signIn(caller.userId);
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
        signIn(u.id);
        const res = await call(r!);
        expect(`${u.id} ${res.status}`).toBe(`${u.id} ${c.allowed.includes(u.id) ? 200 : 403}`);
      }
    });
  }

  it("POST /api/users: a technician is refused and nobody is added", async () => {
    const mod = await import("@/app/api/users/route");
    signIn("u-tomasz");
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
    signIn("u-ines");
    const list = (await (await mod.GET(new Request("http://localhost:3000/api/users"))).json()) as {
      users: { email: string }[];
    };
    expect(list.users.map((u) => u.email)).not.toContain("m@x.example");
  });

  it("a session whose version is stale (role changed, user disabled) counts as signed out", async () => {
    const mod = await import("@/app/api/me/route");
    signIn("u-tomasz");
    session.current!.sv = 0;
    expect((await mod.GET(new Request("http://localhost:3000/api/me"))).status).toBe(401);
  });
});

describe("the access table itself", () => {
  it("has no entry for a route that is gone", () => {
    const keys = new Set(routes.map((r) => r.key));
    expect(Object.keys(ACCESS).filter((k) => !keys.has(k))).toEqual([]);
  });
});
