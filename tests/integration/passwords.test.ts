// Passwords: change your own (with the current one; the old one stops working, your other
// sessions end), the admin's reset that forces a change at the next sign-in (until then APIs but
// the change answer 403 with a plain message), and the policy refusing common and trivial ones.
import { beforeEach, describe, expect, it, vi } from "vitest";
import type { Db } from "@/db/client";
import { getUser } from "@/db/queries/users";
import { AuthBrowser, installHeaderJar } from "../support/auth-browser";
import { DEMO_PASSWORD, ines, priya, tomasz } from "../support/users";
import { freshDb } from "./fixture";

vi.hoisted(() => {
  process.env.NEXTAUTH_URL = "http://localhost:3000";
  process.env.AUTH_SECRET = "test-secret-for-passwords-0123456789abcdef";
});
const jar = installHeaderJar();
const database = vi.hoisted(() => ({ db: null as unknown }));
vi.mock("@/db", () => ({ getDb: async () => database.db }));

const auth = await import("@/app/api/auth/[...nextauth]/route");
const me = await import("@/app/api/me/route");
const pin = await import("@/app/api/pin/route");
const own = await import("@/app/api/account/password/route");
const reset = await import("@/app/api/users/[id]/password/route");
const { passwordProblem } = await import("@/server/auth/password-policy");

const browser = (address?: string) => new AuthBrowser(jar, auth as never, address);
const NEW_PASSWORD = "tundra-ladle-ferry-47";

beforeEach(async () => {
  database.db = (await freshDb({ seeded: true })) as Db;
});

describe("changing your own password", () => {
  it("needs the current password; afterwards the old one stops working and the new one signs in", async () => {
    const b = browser();
    const other = browser("198.51.100.30");
    await b.signIn(tomasz.email, DEMO_PASSWORD);
    await other.signIn(tomasz.email, DEMO_PASSWORD);

    const wrong = await b.call(own.POST, "/api/account/password", {
      body: { currentPassword: "not-the-password", newPassword: NEW_PASSWORD },
    });
    expect(wrong.status).toBe(403);

    const ok = await b.call(own.POST, "/api/account/password", {
      body: { currentPassword: DEMO_PASSWORD, newPassword: NEW_PASSWORD },
    });
    expect(ok.status).toBe(200);
    // This session goes on; the other one ended.
    expect((await b.call(me.GET, "/api/me")).status).toBe(200);
    expect((await other.call(me.GET, "/api/me")).status).toBe(401);

    expect((await browser().signIn(tomasz.email, DEMO_PASSWORD)).status).toBe(401);
    const again = browser();
    expect((await again.signIn(tomasz.email, NEW_PASSWORD)).status).toBe(200);
    expect((await again.call(me.GET, "/api/me")).status).toBe(200);
  });

  it("refuses a common or trivial new password, with the reason beside the field", async () => {
    const b = browser();
    await b.signIn(tomasz.email, DEMO_PASSWORD);
    for (const weak of ["aaaaaaaaaa", "password123", "0123456789", "okafortomasz"]) {
      const res = await b.call(own.POST, "/api/account/password", {
        body: { currentPassword: DEMO_PASSWORD, newPassword: weak },
      });
      expect(`${weak} ${res.status}`).toBe(`${weak} 400`);
      const body = (await res.json()) as { error: { fields: { path: string; message: string }[] } };
      expect(body.error.fields[0]?.path).toBe("newPassword");
    }
  });
});

describe("an admin's reset", () => {
  it("ends the person's sessions and makes them change the password before anything else", async () => {
    const admin = browser("192.0.2.1");
    const tech = browser();
    await admin.signIn(ines.email, DEMO_PASSWORD);
    await tech.signIn(priya.email, DEMO_PASSWORD);

    const techTries = await tech.call(reset.POST, `/api/users/${tomasz.id}/password`, {
      body: { password: "handover-granite-31" },
      params: { id: tomasz.id },
    });
    expect(techTries.status).toBe(403);

    const res = await admin.call(reset.POST, `/api/users/${priya.id}/password`, {
      body: { password: "handover-granite-31" },
      params: { id: priya.id },
    });
    expect(res.status).toBe(200);
    expect((await getUser(database.db as Db, { id: priya.id }))?.mustChangePassword).toBe(true);
    expect((await tech.call(me.GET, "/api/me")).status).toBe(401);

    const next = browser();
    expect((await next.signIn(priya.email, "handover-granite-31")).status).toBe(200);
    const blocked = await next.call(pin.GET, "/api/pin");
    expect(blocked.status).toBe(403);
    expect(((await blocked.json()) as { error: { message: string } }).error.message).toMatch(/choose a new one/);
    expect((await next.call(me.GET, "/api/me")).status).toBe(200);
    // The page guard reads the flag from the token.
    expect((await next.session()) as object).toBeTruthy();

    const changed = await next.call(own.POST, "/api/account/password", {
      body: { currentPassword: "handover-granite-31", newPassword: NEW_PASSWORD },
    });
    expect(changed.status).toBe(200);
    expect((await next.call(pin.GET, "/api/pin")).status).toBe(200);
    expect((await getUser(database.db as Db, { id: priya.id }))?.mustChangePassword).toBe(false);
  });
});

describe("the policy", () => {
  // Judged by zxcvbn-ts (@zxcvbn-ts/core with its common and English dictionaries), a general-purpose
  // password strength estimator: "password2026" and "qwerty12345" are in its common-password lists.
  it("refuses short, common and trivial passwords and the person's own name; accepts a long phrase", async () => {
    const person = { email: tomasz.email, name: tomasz.name };
    for (const weak of ["short", "aaaaaaaaaa", "0123456789", "password2026", "qwerty12345", "okafortomasz"])
      expect(`${weak}: ${(await passwordProblem(weak, person)) === null ? "accepted" : "refused"}`).toBe(
        `${weak}: refused`,
      );
    for (const good of [NEW_PASSWORD, "handover-granite-31", "Seven brass valves hum at dusk"])
      expect(`${good}: ${await passwordProblem(good, person)}`).toBe(`${good}: null`);
  });
});
