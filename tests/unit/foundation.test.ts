// Foundation pieces: the data-dir lock, sign-in throttling, the CSRF/body checks of route
// handlers, the route wrapper (access, input, errors on the wire), download headers, canonical
// JSON and entry validation.
import { existsSync, mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { describe, expect, it, vi } from "vitest";
import { z } from "zod";
import { DataDirLockedError, lockDataDir } from "@/db/lock";
import { mayRead, maySign, mayWrite } from "@/lib/auth/permissions";
import { ACCOUNT_FAILURES, lockMessage, lockWaitMs, SIGN_IN_WINDOW_MS } from "@/lib/auth/sign-in-limits";
import { AppError } from "@/lib/errors";
import { parseEntry } from "@/lib/schemas/entry";
import { canonicalJson, recordHash } from "@/lib/sync/hash";
import { contentDisposition, downloadResponse } from "@/server/http/download";
import { readJson } from "@/server/http/respond";
import { route } from "@/server/http/route";

const who = vi.hoisted(() => ({ user: null as null | { id: string; email: string; name: string; role: string } }));
vi.mock("@/db", () => ({ getDb: async () => ({ fake: "db" }) }));
vi.mock("@/server/auth/require", () => ({
  requireSession: async ({ roles = [] }: { roles?: string[] } = {}) => {
    if (!who.user) throw new AppError("unauthorized", "session", "Sign in first.");
    if (roles.length && !roles.includes(who.user.role)) throw new AppError("forbidden", "role", "Not this role.");
    return { user: who.user, sessionId: "s-test" };
  },
}));

describe("data directory lock", () => {
  it("refuses a second holder while the first is alive, and frees on release", () => {
    const dir = join(mkdtempSync(join(tmpdir(), "rimelog-lock-")), "db");
    const release = lockDataDir(dir);
    expect(readFileSync(`${dir}.lock`, "utf8")).toBe(String(process.pid));
    // Pretend another live process holds it (our parent is alive).
    writeFileSync(`${dir}.lock`, String(process.ppid));
    expect(() => lockDataDir(dir)).toThrow(DataDirLockedError);
    expect(() => lockDataDir(dir)).toThrow(/in use by another Rimelog process/);
    writeFileSync(`${dir}.lock`, String(process.pid));
    release();
    expect(existsSync(`${dir}.lock`)).toBe(false);
  });

  it("takes over a stale lock left by a dead process", () => {
    const dir = join(mkdtempSync(join(tmpdir(), "rimelog-lock-")), "db");
    writeFileSync(`${dir}.lock`, "999999999");
    const release = lockDataDir(dir);
    expect(readFileSync(`${dir}.lock`, "utf8")).toBe(String(process.pid));
    release();
  });
});

describe("sign-in limits", () => {
  const now = Date.parse("2026-11-30T12:00:00Z");
  const ago = (min: number) => now - min * 60_000;
  it("checks attempts while fewer than five failures are in the window, then locks", () => {
    expect(lockWaitMs([], now, ACCOUNT_FAILURES)).toBe(0);
    expect(lockWaitMs([ago(1), ago(2), ago(3), ago(4)], now, ACCOUNT_FAILURES)).toBe(0);
    expect(lockWaitMs([ago(1), ago(2), ago(3), ago(4), ago(5)], now, ACCOUNT_FAILURES)).toBeGreaterThan(0);
  });
  it("lifts the lock when enough of the oldest failures have left the 15-minute window", () => {
    // Five failures 10, 8, 6, 4 and 2 minutes ago: the oldest leaves in 5 minutes.
    expect(lockWaitMs([ago(2), ago(10), ago(6), ago(4), ago(8)], now, ACCOUNT_FAILURES)).toBe(5 * 60_000);
    // Seven failures: three must leave (four left, under five); the third oldest (8 min ago) leaves in 7 minutes.
    const seven = [ago(10), ago(9), ago(8), ago(6), ago(4), ago(2), ago(1)];
    expect(lockWaitMs(seven, now, ACCOUNT_FAILURES)).toBe(7 * 60_000);
    // Failures older than the window do not count.
    expect(lockWaitMs([ago(16), ago(20), ago(1), ago(2), ago(3), ago(4)], now, ACCOUNT_FAILURES)).toBe(0);
    expect(SIGN_IN_WINDOW_MS).toBe(15 * 60_000);
  });
  it("says the wait in plain words", () => {
    expect(lockMessage("account", 5 * 60_000)).toBe(
      "Too many failed sign-ins for this account. Try again in 5 minutes.",
    );
    expect(lockMessage("address", 30_500)).toBe(
      "Too many failed sign-ins for this network address. Try again in 31 seconds.",
    );
  });
});

function req(body: string, headers: Record<string, string>) {
  return new Request("http://localhost:3000/api/x", {
    method: "POST",
    body,
    headers: { host: "localhost:3000", ...headers },
  });
}

describe("readJson (state-changing requests)", () => {
  it("accepts same-origin JSON", async () => {
    await expect(
      readJson(req('{"a":1}', { "content-type": "application/json", origin: "http://localhost:3000" })),
    ).resolves.toEqual({ a: 1 });
  });
  it("refuses a form post, a foreign origin, an oversized body and broken JSON", async () => {
    const codes = async (r: Request, max?: number) =>
      readJson(r, max).then(
        () => "ok",
        (e: AppError) => `${e.status} ${e.code}`,
      );
    expect(await codes(req("a=1", { "content-type": "application/x-www-form-urlencoded" }))).toBe(
      "415 unsupported:request",
    );
    expect(await codes(req("{}", { "content-type": "application/json", origin: "http://evil.example" }))).toBe(
      "403 forbidden:origin",
    );
    expect(await codes(req(JSON.stringify({ x: "y".repeat(200) }), { "content-type": "application/json" }), 100)).toBe(
      "413 too_large:request",
    );
    expect(await codes(req("{nope", { "content-type": "application/json" }))).toBe("400 bad_request:request");
  });
});

describe("the route wrapper", () => {
  const tech = { id: "u-t", email: "t@x.example", name: "T", role: "technician" };
  const post = (body: string, headers: Record<string, string> = {}) =>
    req(body, { "content-type": "application/json", origin: "http://localhost:3000", ...headers });
  const errorOf = async (res: Response) =>
    ((await res.json()) as { error: { code: string; message: string; details: string[]; fields: unknown[] } }).error;

  const handler = route(
    {
      access: ["technician", "facility_admin"],
      surface: "transfer",
      params: z.object({ id: z.string().min(3) }),
      body: z.object({ payload: z.object({ supplyDewar: z.string(), litres: z.number().max(500) }) }),
      maxBytes: 200,
    },
    async ({ user, params, body, db }) => Response.json({ who: user.id, id: params.id, body, db }),
  );
  const ctx = { params: Promise.resolve({ id: "wren" }) };

  it("carries its declared access as data", () => {
    expect(handler.access).toEqual(["technician", "facility_admin"]);
    expect(Object.isFrozen(handler.access)).toBe(true);
  });

  it("answers 401 signed out and 403 for a role not declared, before reading the body", async () => {
    who.user = null;
    expect((await handler(post("{nope"), ctx)).status).toBe(401);
    who.user = { ...tech, role: "researcher" };
    expect((await handler(post("{nope"), ctx)).status).toBe(403);
  });

  it("hands the handler the user, the parsed params and body and the database", async () => {
    who.user = tech;
    const body = { payload: { supplyDewar: "D-7", litres: 60 } };
    const res = await handler(post(JSON.stringify(body)), ctx);
    expect(res.status).toBe(200);
    expect(await res.json()).toEqual({ who: "u-t", id: "wren", body, db: { fake: "db" } });
  });

  it("answers a refused body with 400, each field's problem in plain words, and keeps details", async () => {
    who.user = tech;
    const error = await errorOf(await handler(post(JSON.stringify({ payload: { litres: 900 } })), ctx));
    expect(error.code).toBe("bad_request:transfer");
    expect(error.message).toBe("Check the highlighted fields.");
    expect(error.fields).toEqual([
      { path: "payload.supplyDewar", message: "Fill this in." },
      { path: "payload.litres", message: "Must be at most 500." },
    ]);
    expect(error.details).toEqual(["payload.supplyDewar: Fill this in.", "payload.litres: Must be at most 500."]);
    const params = await errorOf(await handler(post("{}"), { params: Promise.resolve({ id: "x" }) }));
    expect(params.fields).toEqual([{ path: "id", message: "Use at least 3 characters." }]);
  });

  it("keeps readJson's rules for state changes: JSON type, same origin, size bound", async () => {
    who.user = tech;
    expect((await handler(post("{}", { "content-type": "text/plain" }), ctx)).status).toBe(415);
    expect((await handler(post("{}", { origin: "http://evil.example" }), ctx)).status).toBe(403);
    expect((await handler(post(JSON.stringify({ x: "y".repeat(300) })), ctx)).status).toBe(413);
  });

  it("maps a thrown AppError to its status, a zod failure to 400, anything else to 500 without internals", async () => {
    who.user = tech;
    const throwing = (e: unknown) =>
      route({ access: "signed-in", surface: "x" }, async () => {
        throw e;
      })(new Request("http://localhost:3000/api/x"));
    const conflict = await throwing(new AppError("conflict", "x", "Taken."));
    expect([conflict.status, (await errorOf(conflict)).code]).toEqual([409, "conflict:x"]);
    const zod = await throwing(z.object({ a: z.string() }).safeParse({}).error);
    expect(zod.status).toBe(400);
    expect((await errorOf(zod)).fields).toEqual([{ path: "a", message: expect.any(String) }]);
    const oops = await throwing(new Error("relation users: secret detail"));
    expect(oops.status).toBe(500);
    expect(await oops.text()).not.toMatch(/secret|relation/);
  });

  it("lets anyone call a public route without looking at the session", async () => {
    who.user = null;
    const open = route({ access: "public", surface: "health" }, async ({ user }) => Response.json({ user }));
    expect(open.access).toBe("public");
    expect(await (await open(new Request("http://localhost:3000/api/health"))).json()).toEqual({ user: null });
  });
});

describe("download headers", () => {
  it("sends a plain ASCII file name and the real one per RFC 5987 (RFC 6266 section 4.3)", () => {
    // RFC 6266 section 5 shows the same pair: filename="EURO rates"; filename*=utf-8''%e2%82%ac%20rates.
    expect(contentDisposition("Règles (B014).pdf")).toBe(
      "attachment; filename=\"R_gles (B014).pdf\"; filename*=UTF-8''R%C3%A8gles%20%28B014%29.pdf",
    );
    expect(contentDisposition('a"b\\c%41.txt')).toBe(
      "attachment; filename=\"a_b_c_41.txt\"; filename*=UTF-8''a%22b%5Cc%2541.txt",
    );
    expect(contentDisposition("")).toBe("attachment; filename=\"download\"; filename*=UTF-8''download");
  });

  it("never caches, never sniffs, sandboxes stored files and gives the length of bytes", async () => {
    const file = downloadResponse(new Uint8Array([1, 2, 3]), { type: "image/png", fileName: "g.png", sandbox: true });
    expect(Object.fromEntries(file.headers)).toEqual({
      "cache-control": "no-store",
      "content-disposition": "attachment; filename=\"g.png\"; filename*=UTF-8''g.png",
      "content-length": "3",
      "content-security-policy": "sandbox; default-src 'none'",
      "content-type": "image/png",
      "x-content-type-options": "nosniff",
    });
    const csv = downloadResponse("a,b\r\n", { type: "text/csv; charset=utf-8", fileName: "t.csv" });
    expect(csv.headers.get("content-security-policy")).toBeNull();
    expect(await csv.text()).toBe("a,b\r\n");
  });
});

describe("permissions", () => {
  it("keeps audit findings to the safety officer", () => {
    expect(mayWrite("safety_officer", "audit.finding")).toBe(true);
    expect(mayWrite("technician", "audit.finding")).toBe(false);
    expect(mayRead("technician", "audit.finding")).toBe(false);
    expect(mayRead("facility_admin", "audit.finding")).toBe(true);
    expect(maySign("technician", "audited")).toBe(false);
    expect(maySign("researcher", "accepted")).toBe(true);
  });
});

describe("canonical JSON (RFC 8785)", () => {
  it("sorts keys, normalises strings to NFC and drops undefined", () => {
    // RFC 8785 §3.2.3 sorts properties by UTF-16 code units.
    expect(canonicalJson({ b: 1, a: [true, null], é: "e\u0301", u: undefined })).toBe(
      '{"a":[true,null],"b":1,"é":"é"}',
    );
    // RFC 8785 appendix B: numbers serialise as ECMAScript does.
    expect(canonicalJson({ n: 1e21, m: 0.000001, k: -0 })).toBe('{"k":0,"m":0.000001,"n":1e+21}');
  });
  it("changes the record hash when any field changes", () => {
    const e = {
      id: "1b4e28ba-2fa1-4d3b-a3f5-ef19b5a7633b",
      cryostatId: "wren",
      runId: null,
      kind: "note" as const,
      payload: { text: "a" },
      authorId: "u",
      deviceId: "d",
      recordedAt: "2026-12-01T10:00:00.000Z",
      supersedes: null,
      reason: null,
    };
    expect(recordHash({ ...e, payload: { text: "b" } })).not.toBe(recordHash(e));
    expect(recordHash({ ...e })).toBe(recordHash(e));
  });
});

describe("entry validation", () => {
  const base = {
    id: "1b4e28ba-2fa1-4d3b-a3f5-ef19b5a7633b",
    cryostatId: "plover",
    kind: "helium.level",
    authorId: "u-tomasz",
    deviceId: "tab",
    recordedAt: "2026-12-01T10:00:00.000Z",
  };
  it("accepts a well-formed entry and fills defaults", () => {
    const r = parseEntry({ ...base, payload: { percent: 55 } });
    expect(r.ok && r.entry.supersedes).toBe(null);
  });
  it("names the field of a bad payload, a bad time and a correction without reason", () => {
    const bad = parseEntry({ ...base, payload: { percent: 140 } });
    expect(!bad.ok && bad.problems.join()).toMatch(/^payload\.percent:/);
    const time = parseEntry({ ...base, recordedAt: "2026-12-01T11:00:00+01:00", payload: { percent: 5 } });
    expect(!time.ok && time.problems.join()).toMatch(/recordedAt/);
    const corr = parseEntry({ ...base, payload: { percent: 5 }, supersedes: base.id });
    expect(!corr.ok && corr.problems.join()).toMatch(/needs a reason/);
  });
});
