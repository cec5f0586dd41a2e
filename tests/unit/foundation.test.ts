// Foundation pieces: the data-dir lock, sign-in throttling, the CSRF/body checks of route
// handlers, canonical JSON and entry validation.
import { existsSync, mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { DataDirLockedError, lockDataDir } from "@/db/lock";
import { mayRead, maySign, mayWrite } from "@/lib/auth/permissions";
import type { AppError } from "@/lib/errors";
import { parseEntry } from "@/lib/schemas/entry";
import { canonicalJson, recordHash } from "@/lib/sync/hash";
import { throttleDelayMs } from "@/server/auth/credentials";
import { readJson } from "@/server/http/respond";

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

describe("sign-in throttling", () => {
  it("lets five failures pass at full speed, then doubles the delay up to 8 s", () => {
    expect([0, 4, 5, 6, 7, 8, 20].map(throttleDelayMs)).toEqual([0, 0, 1000, 2000, 4000, 8000, 8000]);
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
