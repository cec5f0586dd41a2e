// Sessions that end, tried as an attacker with a copied cookie would: sign-in through the real
// next-auth route, then /api/me and /api/pin with the cookie and with a copy of it; sign-out ends
// the server-side session for every copy; refreshing (GET /api/auth/session) never moves the token's
// expiry past the session's absolute expiry (one long shift); an admin ends a person's sessions.
import { decode } from "next-auth/jwt";
import { afterEach, beforeAll, beforeEach, describe, expect, it, vi } from "vitest";
import type { Db } from "@/db/client";
import { AuthBrowser, installHeaderJar } from "../support/auth-browser";
import { DEMO_PASSWORD, ines, tomasz } from "../support/users";
import { freshDb } from "./fixture";

vi.hoisted(() => {
  process.env.NEXTAUTH_URL = "http://localhost:3000";
  process.env.AUTH_SECRET = "test-secret-for-sessions-0123456789abcdef";
});
const jar = installHeaderJar();
const database = vi.hoisted(() => ({ db: null as unknown }));
vi.mock("@/db", () => ({ getDb: async () => database.db }));

const auth = await import("@/app/api/auth/[...nextauth]/route");
const me = await import("@/app/api/me/route");
const pin = await import("@/app/api/pin/route");
const { sessionLifetimeS } = await import("@/server/auth/sessions");

const browser = (address?: string) => new AuthBrowser(jar, auth as never, address);

async function tokenOf(b: AuthBrowser) {
  return decode({ token: b.sessionToken, secret: process.env.AUTH_SECRET! });
}

beforeAll(async () => {
  database.db = await freshDb({ seeded: true });
});
beforeEach(async () => {
  database.db = (await freshDb({ seeded: true })) as Db;
});
afterEach(() => {
  vi.useRealTimers();
});

describe("signing in and out", () => {
  it("a signed-in browser gets /api/me; after sign-out a copy of its cookie gets 401", async () => {
    const b = browser();
    const res = await b.signIn(tomasz.email, DEMO_PASSWORD);
    expect(res.status).toBe(200);
    expect(b.sessionToken).toBeTruthy();
    const copied = b.copy("198.51.100.9");
    expect((await b.call(me.GET, "/api/me")).status).toBe(200);
    expect((await copied.call(me.GET, "/api/me")).status).toBe(200);
    expect((await copied.call(pin.GET, "/api/pin")).status).toBe(200);

    expect((await b.signOut()).status).toBe(200);
    expect(b.sessionToken).toBeUndefined();
    // The copy still holds a well-signed, unexpired JWT: the server-side session says no.
    expect(await tokenOf(copied)).toMatchObject({ uid: tomasz.id });
    expect((await copied.call(me.GET, "/api/me")).status).toBe(401);
    expect((await copied.call(pin.GET, "/api/pin")).status).toBe(401);
    expect(await copied.session()).toEqual({});
  });

  it("a second sign-in is its own session: signing out of one leaves the other", async () => {
    const a = browser();
    const b = browser();
    await a.signIn(tomasz.email, DEMO_PASSWORD);
    await b.signIn(tomasz.email, DEMO_PASSWORD);
    expect((await tokenOf(a))?.sid).not.toBe((await tokenOf(b))?.sid);
    await a.signOut();
    expect((await b.call(me.GET, "/api/me")).status).toBe(200);
  });
});

describe("the absolute lifetime", () => {
  it("is one long shift (14 h) unless RIMELOG_SESSION_HOURS says otherwise", () => {
    expect(sessionLifetimeS()).toBe(14 * 3600);
  });

  it("refreshing never moves the token's expiry past it, and at the end the session is over", async () => {
    vi.useFakeTimers({ toFake: ["Date"] });
    const start = Date.parse("2026-12-01T06:00:00Z");
    vi.setSystemTime(start);
    const b = browser();
    await b.signIn(tomasz.email, DEMO_PASSWORD);
    const first = await tokenOf(b);
    const absolute = Math.floor(start / 1000) + 14 * 3600;
    expect(first?.aexp).toBe(absolute);
    expect(first?.exp).toBeLessThanOrEqual(absolute);

    for (const hours of [1, 6, 13, 13.9]) {
      vi.setSystemTime(start + hours * 3600_000);
      const s = await b.session();
      expect(s).toMatchObject({ user: { id: tomasz.id } });
      const t = await tokenOf(b);
      expect(t?.exp).toBeLessThanOrEqual(absolute);
      expect(t?.aexp).toBe(absolute);
    }
    // A copy taken late in the shift is no better.
    const late = b.copy();
    vi.setSystemTime(start + 14 * 3600_000 + 60_000);
    expect(await b.session()).toEqual({});
    expect((await late.call(me.GET, "/api/me")).status).toBe(401);
  });
});

describe("an admin ends a person's sessions", () => {
  it("POST /api/users/[id]/sessions ends every session of that person; others keep theirs", async () => {
    const sessionsRoute = await import("@/app/api/users/[id]/sessions/route");
    const tech = browser();
    const techPhone = browser("198.51.100.20");
    const admin = browser("192.0.2.1");
    await tech.signIn(tomasz.email, DEMO_PASSWORD);
    await techPhone.signIn(tomasz.email, DEMO_PASSWORD);
    await admin.signIn(ines.email, DEMO_PASSWORD);

    const refused = await tech.call(sessionsRoute.POST, `/api/users/${tomasz.id}/sessions`, {
      body: {},
      params: { id: tomasz.id },
    });
    expect(refused.status).toBe(403);

    const res = await admin.call(sessionsRoute.POST, `/api/users/${tomasz.id}/sessions`, {
      body: {},
      params: { id: tomasz.id },
    });
    expect(res.status).toBe(200);
    expect(await res.json()).toEqual({ ended: 2 });
    expect((await tech.call(me.GET, "/api/me")).status).toBe(401);
    expect((await techPhone.call(me.GET, "/api/me")).status).toBe(401);
    expect((await admin.call(me.GET, "/api/me")).status).toBe(200);
  });
});
