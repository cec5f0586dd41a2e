// Access control across every route handler: each one is found on disk, called with no session
// (must answer 401, never data), and the role-restricted ones are called as each role.
// next-auth's session look-up and the server database are replaced by test doubles.
import { readdirSync, statSync } from "node:fs";
import { join, relative } from "node:path";
import { beforeAll, describe, expect, it, vi } from "vitest";
import type { Db } from "@/db/client";
import { DEMO_USERS } from "@/db/seed";
import { freshDb } from "./fixture";

const session = vi.hoisted(() => ({
  current: null as null | { user: { id: string; name: string; email: string; role: string }; sv: number },
}));
const database = vi.hoisted(() => ({ db: null as unknown }));
vi.mock("next-auth", async (orig) => ({ ...(await orig<object>()), getServerSession: async () => session.current }));
vi.mock("@/db", () => ({ getDb: async () => database.db }));

/** Route files that are public on purpose. */
const PUBLIC = new Set(["app/api/auth/[...nextauth]/route.ts", "app/api/health/route.ts"]);
const METHODS = ["GET", "POST", "PUT", "PATCH", "DELETE"] as const;

function routeFiles(dir = "app/api"): string[] {
  return readdirSync(dir).flatMap((name) => {
    const p = join(dir, name);
    return statSync(p).isDirectory() ? routeFiles(p) : name === "route.ts" ? [relative(process.cwd(), p)] : [];
  });
}

function call(
  handler: (req: Request, ctx: unknown) => Promise<Response>,
  method: string,
  url = "http://localhost:3000/api/x",
) {
  const init: RequestInit = {
    method,
    headers: { host: "localhost:3000", "content-type": "application/json", origin: "http://localhost:3000" },
  };
  if (method !== "GET") init.body = "{}";
  // Dynamic segments all get the same harmless value.
  const params = new Proxy({}, { get: (_t, k) => (k === "then" ? undefined : "heron") });
  return handler(new Request(url, init), { params: Promise.resolve(params) });
}

function signIn(id: string | null) {
  const u = DEMO_USERS.find((x) => x.id === id);
  session.current = u ? { user: { id: u.id, name: u.name, email: u.email, role: u.role }, sv: 1 } : null;
}

beforeAll(async () => {
  database.db = (await freshDb({ seeded: true })) as Db;
});

describe("every API route without a session", () => {
  const files = routeFiles().filter((f) => !PUBLIC.has(f));
  it("finds the route handlers", () => {
    expect(files.length).toBeGreaterThanOrEqual(8);
  });
  for (const file of files) {
    it(`${file} answers 401 to each method`, async () => {
      const mod = (await import(`@/${file}`)) as Record<string, unknown>;
      const methods = METHODS.filter((m) => typeof mod[m] === "function");
      expect(methods.length).toBeGreaterThan(0);
      signIn(null);
      for (const m of methods) {
        const res = await call(mod[m] as never, m);
        expect(`${m} ${res.status}`).toBe(`${m} 401`);
      }
    });
  }
});

describe("role-restricted routes", () => {
  const cases: { file: string; method: (typeof METHODS)[number]; allowed: string[] }[] = [
    { file: "app/api/users/route.ts", method: "GET", allowed: ["u-ines"] },
  ];
  for (const c of cases) {
    it(`${c.method} ${c.file}: only ${c.allowed.join(", ")}`, async () => {
      const mod = (await import(`@/${c.file}`)) as Record<string, (req: Request, ctx: unknown) => Promise<Response>>;
      for (const u of DEMO_USERS) {
        signIn(u.id);
        const res = await call(mod[c.method]!, c.method);
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
    const list = (await (await mod.GET()).json()) as { users: { email: string }[] };
    expect(list.users.map((u) => u.email)).not.toContain("m@x.example");
  });

  it("a session whose version is stale (role changed, user disabled) counts as signed out", async () => {
    const mod = await import("@/app/api/me/route");
    signIn("u-tomasz");
    session.current!.sv = 0;
    expect((await mod.GET()).status).toBe(401);
  });
});
