// Registered tablets against a real (in-memory) database, through the route handlers: a device id
// is issued by the server and bound to the users who sign in on the tablet; entries under an id
// nobody registered, or by a user who never signed in on that tablet, or from a withdrawn tablet
// are refused one by one while the rest of the batch is stored; a withdrawn id cannot register
// again, and a fresh registration does not let the old id's entries in; only the facility admin
// lists and withdraws tablets. The tablet's own side (lib/sync/register.ts) stops pushing once
// told it was withdrawn and keeps everything.
import { eq } from "drizzle-orm";
import { beforeEach, describe, expect, it, vi } from "vitest";
import type { Db } from "@/db/client";
import { devices, entries } from "@/db/schema";
import { DEMO_TABLET, DEMO_USERS } from "@/db/seed";
import { AppError } from "@/lib/errors";
import { recordEntriesIn } from "@/lib/local/store";
import { DEVICE_CODES, type DeviceRegistered, type DeviceView } from "@/lib/schemas/device";
import type { SessionUser } from "@/lib/schemas/user";
import { syncOnce } from "@/lib/sync/client";
import type { PushReply } from "@/lib/sync/protocol";
import { note, noteDraft } from "../support/entries";
import { inProcessServer, registeredTablet } from "../support/tablet";
import { ines, priya, tomasz } from "../support/users";
import { freshDb } from "./fixture";

const state: { db?: Db; user: SessionUser | null } = { user: null };
vi.mock("@/db", () => ({ getDb: async () => state.db }));
vi.mock("@/server/tick", () => ({ ensureServerTick: () => undefined, kickServerTick: () => undefined }));
vi.mock("@/server/auth/require", () => ({
  requireSession: async ({ roles = [] }: { roles?: string[] } = {}) => {
    if (!state.user) throw new AppError("unauthorized", "session", "Sign in first.");
    if (roles.length && !roles.includes(state.user.role)) throw new AppError("forbidden", "session", "Not yours.");
    return { user: state.user, sessionId: "s-test" };
  },
  requireUser: async (...roles: string[]) => {
    if (!state.user) throw new AppError("unauthorized", "session", "Sign in first.");
    if (roles.length && !roles.includes(state.user.role)) throw new AppError("forbidden", "session", "Not yours.");
    return state.user;
  },
}));
const push = (await import("@/app/api/sync/push/route")).POST;
const devicesRoute = await import("@/app/api/devices/route");
const revokeRoute = (await import("@/app/api/devices/[id]/revoke/route")).POST;

const ORIGIN = "http://localhost:3000";
const headers = { "content-type": "application/json", origin: ORIGIN, host: "localhost:3000" };
const post = (url: string, body: unknown) =>
  new Request(`${ORIGIN}${url}`, { method: "POST", headers, body: JSON.stringify(body) });

async function as<T>(user: SessionUser | null, call: () => Promise<Response>): Promise<{ status: number; body: T }> {
  state.user = user;
  const res = await call();
  return { status: res.status, body: (await res.json()) as T };
}
const register = (user: SessionUser, body: object = {}) =>
  as<DeviceRegistered & { error?: { code: string; message: string } }>(user, () =>
    devicesRoute.POST(post("/api/devices", body)),
  );
const pushAs = async (user: SessionUser, list: unknown[]) =>
  (await as<PushReply>(user, () => push(post("/api/sync/push", { entries: list })))).body;
const revoke = (user: SessionUser, id: string, body: object) =>
  as<{ ok?: boolean; error?: { code: string } }>(user, () =>
    revokeRoute(post(`/api/devices/${id}/revoke`, body), { params: Promise.resolve({ id }) }),
  );
const codes = (r: PushReply) => Object.fromEntries(r.rejected.map((x) => [x.id, x.code]));
const stored = async (id: string) => (await state.db!.$count(entries, eq(entries.id, id))) === 1;

beforeEach(async () => {
  state.db = await freshDb({ seeded: true });
  state.user = null;
});

describe("registration is a server act", () => {
  it("issues an id and a secret, binds each user who signs in with them, and refuses a wrong secret", async () => {
    const first = await register(tomasz, { pending: 0 });
    expect(first.status).toBe(200);
    expect(first.body.deviceId).toMatch(/^tab-[0-9a-f-]{36}$/);
    expect(first.body.deviceSecret).toBeTruthy();
    const [row] = await state.db!.select().from(devices).where(eq(devices.id, first.body.deviceId));
    expect(row?.secretHash).toMatch(/^[0-9a-f]{64}$/);
    expect(row?.secretHash).not.toContain(first.body.deviceSecret!); // only its SHA-256 is kept

    // Priya signs in on the same tablet: it sends what it holds, and she is bound too.
    const same = await register(priya, {
      deviceId: first.body.deviceId,
      deviceSecret: first.body.deviceSecret,
      pending: 3,
    });
    expect(same.body).toEqual({ deviceId: first.body.deviceId });
    // Someone who only knows the id (not the secret) is not bound.
    const guess = await register(priya, { deviceId: first.body.deviceId, deviceSecret: "guessed" });
    expect(guess.status).toBe(409);
    expect(guess.body.error?.code).toBe(DEVICE_CODES.unknown);
    const unknown = await register(priya, { deviceId: "tab-invented" });
    expect(unknown.status).toBe(409);
  });

  it("lets the user who pushed under an id from before registration adopt it once; nobody else", async () => {
    await state.db!.insert(devices).values({ id: "tab-legacy", userId: tomasz.id });
    expect((await register(priya, { deviceId: "tab-legacy" })).status).toBe(409);
    const adopted = await register(tomasz, { deviceId: "tab-legacy" });
    expect(adopted.status).toBe(200);
    expect(adopted.body.deviceSecret).toBeTruthy();
    expect((await register(tomasz, { deviceId: "tab-legacy" })).status).toBe(409); // once: now the secret is needed
    expect((await pushAs(tomasz, [note("from the old tablet", { deviceId: "tab-legacy" })])).accepted).toHaveLength(1);
  });
});

describe("a push is checked against the registration", () => {
  it("refuses another user's entries under someone's device id; accepts them once that user signed in on it", async () => {
    const tablet = (await register(tomasz)).body;
    const priyas = note("under Tomasz's tablet", { authorId: priya.id, deviceId: tablet.deviceId });
    const r = await pushAs(priya, [priyas]);
    expect(codes(r)[priyas.id]).toBe(DEVICE_CODES.entryUser);
    expect(r.rejected[0]?.message).toMatch(/Sign in on the tablet while online/);
    expect(await stored(priyas.id)).toBe(false);

    // Control: she signs in on that tablet (it holds the secret) and the same entry is accepted.
    await register(priya, { deviceId: tablet.deviceId, deviceSecret: tablet.deviceSecret });
    expect((await pushAs(priya, [priyas])).accepted.map((a) => a.id)).toEqual([priyas.id]);
    expect((await pushAs(tomasz, [note("his own", { deviceId: tablet.deviceId })])).accepted).toHaveLength(1);
  });

  it("refuses an entry under an id nobody registered, and stores the rest of the batch", async () => {
    const tablet = (await register(tomasz)).body;
    const invented = note("invented", { deviceId: "tab-made-up-by-the-pusher" });
    const good = note("registered", { deviceId: tablet.deviceId });
    const r = await pushAs(tomasz, [invented, good]);
    expect(codes(r)[invented.id]).toBe(DEVICE_CODES.entryUnknown);
    expect(r.accepted.map((a) => a.id)).toEqual([good.id]);
    expect(await stored(invented.id)).toBe(false);
    // Pushing under an id does not register it (the old "first pusher creates the device" is gone).
    expect(await state.db!.$count(devices, eq(devices.id, invented.deviceId))).toBe(0);
  });

  it("refuses a withdrawn tablet's entries with a clear message and stores the other tablets' entries of the batch", async () => {
    const a = (await register(tomasz)).body;
    const b = (await register(tomasz)).body;
    expect((await revoke(ines, a.deviceId, { reason: "Left on the loading dock" })).status).toBe(200);
    const fromA = note("from the withdrawn one", { deviceId: a.deviceId });
    const fromB = note("from the other", { deviceId: b.deviceId });
    const r = await pushAs(tomasz, [fromA, fromB]);
    expect(codes(r)[fromA.id]).toBe(DEVICE_CODES.entryWithdrawn);
    expect(r.rejected[0]?.message).toMatch(/withdrawn by the facility admin on .+Ask the facility admin/);
    expect(r.accepted.map((x) => x.id)).toEqual([fromB.id]);
    expect(await stored(fromA.id)).toBe(false);
  });

  it("a withdrawn id cannot register again; a new registration gets a new id, and the old id's entries stay refused", async () => {
    const old = (await register(tomasz)).body;
    await revoke(ines, old.deviceId, { reason: "Reported lost" });
    const again = await register(tomasz, { deviceId: old.deviceId, deviceSecret: old.deviceSecret });
    expect(again.status).toBe(403);
    expect(again.body.error?.code).toBe(DEVICE_CODES.withdrawn);
    expect(again.body.error?.message).toMatch(/^This tablet was withdrawn by the facility admin on /);

    const fresh = (await register(tomasz)).body;
    expect(fresh.deviceId).not.toBe(old.deviceId);
    const stale = note("still under the old id", { deviceId: old.deviceId });
    expect(codes(await pushAs(tomasz, [stale]))[stale.id]).toBe(DEVICE_CODES.entryWithdrawn);
    expect((await pushAs(tomasz, [note("new id", { deviceId: fresh.deviceId })])).accepted).toHaveLength(1);
  });
});

describe("the tablet told it was withdrawn", () => {
  it("shows why, pushes nothing more and keeps every unsent entry", async () => {
    const t = await registeredTablet(state.db!, tomasz, "withdrawn");
    await recordEntriesIn(t, [noteDraft("before"), noteDraft("kept")]);
    const deviceId = (await t.getMeta("deviceId"))!;
    await revoke(ines, deviceId, { reason: "Screen cracked" });

    const { transport, stats } = inProcessServer(state.db!, tomasz);
    const result = await syncOnce(t, transport);
    expect(result.accepted + result.rejected).toBe(0);
    expect(stats.pushes).toBe(0);
    expect(await t.outbox.count()).toBe(2);
    expect(await t.entries.where("sync").equals("pending").count()).toBe(2);
    expect((await t.getMeta("deviceWithdrawn"))?.message).toMatch(/withdrawn by the facility admin/);
    expect(await t.getMeta("deviceId")).toBe(deviceId); // nothing re-stamped, nothing deleted
  });
});

describe("the facility admin's tablets", () => {
  it("only the facility admin lists and withdraws tablets (route × role), and a reason is required", async () => {
    const tablet = (await register(tomasz, { pending: 4 })).body;
    for (const u of DEMO_USERS) {
      const user = { id: u.id, name: u.name, email: u.email, role: u.role };
      const list = await as(user, () => devicesRoute.GET(new Request(`${ORIGIN}/api/devices`)));
      expect(`${u.id} ${list.status}`).toBe(`${u.id} ${u.role === "facility_admin" ? 200 : 403}`);
      if (u.role !== "facility_admin") {
        expect(`${u.id} ${(await revoke(user, tablet.deviceId, { reason: "not mine to say" })).status}`).toBe(
          `${u.id} 403`,
        );
      }
    }
    expect((await as(null, () => devicesRoute.GET(new Request(`${ORIGIN}/api/devices`)))).status).toBe(401);
    expect((await revoke(ines, tablet.deviceId, {})).status).toBe(400);
    expect((await revoke(ines, "tab-nobody", { reason: "gone" })).status).toBe(404);

    const before = (
      await as<{ devices: DeviceView[] }>(ines, () => devicesRoute.GET(new Request(`${ORIGIN}/api/devices`)))
    ).body.devices;
    const mine = before.find((d) => d.id === tablet.deviceId)!;
    expect(mine).toMatchObject({ pendingCount: 4, registered: true, revoked: null });
    expect(mine.users.map((u) => u.name)).toEqual([tomasz.name]);
    // The demo tablet is registered with the people who wrote the demo history on it.
    const demo = before.find((d) => d.id === DEMO_TABLET)!;
    expect(demo.registered).toBe(true);
    expect(demo.users.length).toBeGreaterThanOrEqual(3);

    expect((await revoke(ines, tablet.deviceId, { reason: "Lost in the helium store" })).status).toBe(200);
    expect((await revoke(ines, tablet.deviceId, { reason: "again" })).status).toBe(409);
    const after = (
      await as<{ devices: DeviceView[] }>(ines, () => devicesRoute.GET(new Request(`${ORIGIN}/api/devices`)))
    ).body.devices;
    expect(after.find((d) => d.id === tablet.deviceId)?.revoked).toMatchObject({
      by: ines.id,
      byName: ines.name,
      reason: "Lost in the helium store",
    });
  });
});
