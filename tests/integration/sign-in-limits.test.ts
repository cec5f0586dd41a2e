// Sign-in limits through the real next-auth route: counted in the database before the password is
// checked, so ten parallel wrong passwords cannot all be tried; a locked account refuses the
// correct password too, with 429, the wait in plain words and Retry-After; the lock lifts when the
// window has passed; an address that fails across many accounts is limited as well.
import { afterEach, beforeEach, describe, expect, it, vi } from "vitest";
import type { Db } from "@/db/client";
import { ACCOUNT_FAILURES, ADDRESS_FAILURES, SIGN_IN_WINDOW_MS } from "@/lib/auth/sign-in-limits";
import { AuthBrowser, installHeaderJar } from "../support/auth-browser";
import { DEMO_PASSWORD, priya, tomasz } from "../support/users";
import { freshDb } from "./fixture";

vi.hoisted(() => {
  process.env.NEXTAUTH_URL = "http://localhost:3000";
  process.env.AUTH_SECRET = "test-secret-for-sign-in-limits-0123456789";
});
const jar = installHeaderJar();
const database = vi.hoisted(() => ({ db: null as unknown }));
vi.mock("@/db", () => ({ getDb: async () => database.db }));

const auth = await import("@/app/api/auth/[...nextauth]/route");
const { reserveAttempt } = await import("@/server/auth/credentials");
const { settleSignInAttempt } = await import("@/db/queries/users");
const browser = (address?: string) => new AuthBrowser(jar, auth as never, address);

beforeEach(async () => {
  database.db = (await freshDb({ seeded: true })) as Db;
});
afterEach(() => {
  vi.useRealTimers();
});

type Answer = { url?: string; error?: { code: string; message: string } };
const errorOf = (a: Answer) => (a.url ? new URL(a.url).searchParams.get("error") : null);

describe("per account", () => {
  it("ten parallel wrong passwords: at most five are checked, the rest get 429", async () => {
    const b = browser();
    const csrf = await b.csrf();
    const answers = await Promise.all(
      Array.from({ length: 10 }, (_, i) => b.signIn(tomasz.email, `wrong-password-${i}`, csrf)),
    );
    // Attempts in flight count as failures until checked, so as many as all ten may be refused.
    const statuses = answers.map((r) => r.status);
    expect(statuses.every((s) => s === 401 || s === 429)).toBe(true);
    expect(statuses.filter((s) => s === 429).length).toBeGreaterThanOrEqual(10 - ACCOUNT_FAILURES);
    expect(statuses.filter((s) => s === 401).length).toBeLessThanOrEqual(ACCOUNT_FAILURES);
    const limited = answers.find((r) => r.status === 429)!;
    expect(Number(limited.headers.get("retry-after"))).toBeGreaterThan(14 * 60);
    const body = (await limited.json()) as Answer;
    expect(body.error?.code).toBe("rate_limited:signin");
    // What next-auth's signIn() shows the person: the message from the url's error parameter.
    expect(errorOf(body)).toBe("Too many failed sign-ins for this account. Try again in 15 minutes.");
  });

  it("inside the lock the correct password is refused too; after the window it works", async () => {
    vi.useFakeTimers({ toFake: ["Date"] });
    const start = Date.parse("2026-12-01T06:00:00Z");
    vi.setSystemTime(start);
    const b = browser();
    for (let i = 0; i < ACCOUNT_FAILURES; i++) expect((await b.signIn(tomasz.email, "not-it-at-all")).status).toBe(401);
    vi.setSystemTime(start + 5 * 60_000);
    const locked = await b.signIn(tomasz.email, DEMO_PASSWORD);
    expect(locked.status).toBe(429);
    expect(errorOf((await locked.json()) as Answer)).toBe(
      "Too many failed sign-ins for this account. Try again in 10 minutes.",
    );
    expect(b.sessionToken).toBeUndefined();
    // Another account from the same address is not locked by it.
    expect((await b.copy().signIn(priya.email, DEMO_PASSWORD)).status).toBe(200);
    // Refused attempts do not count: once the first failures leave the window, it signs in.
    vi.setSystemTime(start + SIGN_IN_WINDOW_MS + 1000);
    const c = browser();
    expect((await c.signIn(tomasz.email, DEMO_PASSWORD)).status).toBe(200);
    expect(c.sessionToken).toBeTruthy();
  });

  it("a successful sign-in starts the count again", async () => {
    const b = browser();
    for (let i = 0; i < ACCOUNT_FAILURES - 1; i++) await b.signIn(tomasz.email, "not-it-at-all");
    expect((await b.signIn(tomasz.email, DEMO_PASSWORD)).status).toBe(200);
    for (let i = 0; i < ACCOUNT_FAILURES - 1; i++)
      expect((await browser().signIn(tomasz.email, "not-it-at-all")).status).toBe(401);
  });
});

describe("per address", () => {
  it("many accounts tried from one address: the address is limited", async () => {
    const b = browser("198.51.100.66");
    // Two wrong passwords through the route, the rest of the address's failures counted directly
    // (each through the route would cost a bcrypt compare).
    expect((await b.signIn("nobody-a@larchmere.example", "guess-guess-guess")).status).toBe(401);
    expect((await b.signIn("nobody-b@larchmere.example", "guess-guess-guess")).status).toBe(401);
    for (let i = 2; i < ADDRESS_FAILURES; i++) {
      const id = await reserveAttempt(database.db as Db, {
        email: `nobody-${i}@larchmere.example`,
        address: b.address,
      });
      await settleSignInAttempt(database.db as Db, { id, ok: false });
    }
    const next = await b.signIn(tomasz.email, DEMO_PASSWORD);
    expect(next.status).toBe(429);
    expect(errorOf((await next.json()) as Answer)).toMatch(/^Too many failed sign-ins for this network address\./);
    // Another address is not affected.
    expect((await browser("198.51.100.67").signIn(tomasz.email, DEMO_PASSWORD)).status).toBe(200);
  }, 60_000);
});
