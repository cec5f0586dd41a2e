// The proxy (proxy.ts) by its explicit path rules: files and APIs pass, pages need a session
// (even one named like a file), a page for other roles answers 403, a forced password change leads
// to My account; pages get a nonce-based CSP with no 'unsafe-inline' for scripts; HSTS on https;
// a download keeps its own sandbox CSP (the proxy sets none on API routes).
import { NextRequest } from "next/server";
import { encode } from "next-auth/jwt";
import { afterEach, describe, expect, it } from "vitest";
import type { Role } from "@/lib/schemas/user";
import { contentSecurityPolicy, proxy } from "@/proxy";
import { downloadResponse } from "@/server/http/download";

const SECRET = "test-secret-for-the-proxy-0123456789abcdef";
process.env.AUTH_SECRET = SECRET;

async function cookieFor(role: Role, extra: Record<string, unknown> = {}) {
  const token = await encode({ token: { uid: "u-x", sid: "s-x", role, sv: 1, aexp: 0, ...extra }, secret: SECRET });
  return `next-auth.session-token=${token}`;
}

function get(path: string, cookie?: string, base = "http://localhost:3000") {
  return proxy(new NextRequest(`${base}${path}`, { headers: cookie ? { cookie } : {} }));
}

const scriptSrc = (csp: string | null) =>
  csp
    ?.split(";")
    .map((d) => d.trim())
    .find((d) => d.startsWith("script-src")) ?? "";

afterEach(() => {
  delete process.env.NEXTAUTH_URL;
});

describe("path rules, not file endings", () => {
  it("a page path ending in .png needs a session like any page", async () => {
    const res = await get("/cryostats/heron.png");
    expect(res.status).toBe(307);
    const to = new URL(res.headers.get("location")!);
    expect(to.pathname).toBe("/signin");
    expect(to.searchParams.get("next")).toBe("/cryostats/heron.png");
    for (const p of ["/cryostats/x.js", "/runs/a.map", "/anything.css"]) expect((await get(p)).status).toBe(307);
  });

  it("the listed public files and the API pass without a session", async () => {
    for (const p of ["/sw.js", "/manifest.webmanifest", "/icons/icon.svg", "/api/me", "/api/health"]) {
      const res = await get(p);
      expect(`${p} ${res.status} ${res.headers.get("location")}`).toBe(`${p} 200 null`);
    }
    expect((await get("/signin")).status).toBe(200);
  });

  it("a page for other roles answers 403; the right role passes", async () => {
    const tech = await cookieFor("technician");
    const admin = await cookieFor("facility_admin");
    for (const p of ["/admin/templates", "/admin/users", "/admin/mail", "/admin/rules", "/audit"]) {
      expect(`${p} ${(await get(p, tech)).status}`).toBe(`${p} 403`);
    }
    expect((await get("/admin/templates", admin)).status).toBe(200);
    expect((await get("/procedures", tech)).status).toBe(200);
  });

  it("after a password reset every page but My account leads to the change form", async () => {
    const reset = await cookieFor("technician", { mc: true });
    const res = await get("/procedures", reset);
    expect(res.status).toBe(307);
    expect(new URL(res.headers.get("location")!).pathname).toBe("/account");
    expect((await get("/account", reset)).status).toBe(200);
  });
});

describe("headers", () => {
  it("pages get a fresh nonce in script-src and no 'unsafe-inline' there; the nonce reaches the render", async () => {
    const tech = await cookieFor("technician");
    const a = await get("/procedures", tech);
    const b = await get("/procedures", tech);
    const csp = a.headers.get("content-security-policy");
    expect(scriptSrc(csp)).toMatch(/'nonce-[A-Za-z0-9+/=]{20,}'/);
    expect(scriptSrc(csp)).not.toContain("'unsafe-inline'");
    expect(csp).toContain("object-src 'none'");
    expect(csp).toContain("frame-ancestors 'none'");
    expect(csp).not.toBe(b.headers.get("content-security-policy"));
    const nonce = /'nonce-([^']+)'/.exec(csp!)![1];
    // NextResponse.next({ request: { headers } }) hands the render these request headers.
    expect(a.headers.get("x-middleware-request-x-nonce")).toBe(nonce);
    expect(scriptSrc(contentSecurityPolicy("n", false))).toBe("script-src 'self' 'nonce-n' 'strict-dynamic'");
  });

  it("HSTS only when the public URL is https", async () => {
    expect((await get("/signin")).headers.get("strict-transport-security")).toBeNull();
    process.env.NEXTAUTH_URL = "https://rimelog.larchmere.example";
    expect((await get("/signin")).headers.get("strict-transport-security")).toMatch(/^max-age=\d{8,}/);
    expect((await get("/api/me")).headers.get("strict-transport-security")).toMatch(/^max-age=/);
    delete process.env.NEXTAUTH_URL;
    const viaRequest = await get("/signin", undefined, "https://rimelog.larchmere.example");
    expect(viaRequest.headers.get("strict-transport-security")).toMatch(/^max-age=/);
  });

  it("API routes get no CSP from the proxy, so a download keeps its own sandbox policy", async () => {
    const res = await get("/api/attachments/0b9d6f8e-1f2a-4c3b-9d4e-5f6a7b8c9d0e");
    expect(res.headers.get("content-security-policy")).toBeNull();
    const file = downloadResponse(new Uint8Array([1, 2, 3]), { type: "image/png", fileName: "a.png", sandbox: true });
    expect(file.headers.get("content-security-policy")).toBe("sandbox; default-src 'none'");
  });
});
