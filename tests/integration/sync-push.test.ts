// The push and pull route handlers against a real (in-memory) database: malformed, oversized,
// wrong-type, cross-origin, signed-out and wrong-role pushes get a clear 4xx or a per-entry
// refusal, nothing is written for them, and the tablet keeps its entries.
import { randomUUID } from "node:crypto";
import { beforeEach, describe, expect, it, vi } from "vitest";
import type { Db } from "@/db/client";
import { entries } from "@/db/schema";
import { AppError } from "@/lib/errors";
import { recordEntriesIn } from "@/lib/local/store";
import type { SessionUser } from "@/lib/schemas/user";
import { syncOnce } from "@/lib/sync/client";
import { PUSH_LIMITS, type PullReply, type PushReply } from "@/lib/sync/protocol";
import { type Transport, TransportError } from "@/lib/sync/transport";
import { note, noteDraft } from "../support/entries";
import { nothingNew, registeredDeviceId, signedInTablet } from "../support/tablet";
import { grace, tomasz } from "../support/users";
import { freshDb } from "./fixture";

const state: { db?: Db; user: SessionUser | null } = { user: null };
vi.mock("@/db", () => ({ getDb: async () => state.db }));
// The server's background tick (chain signing, mail) is not part of these tests.
vi.mock("@/server/tick", () => ({ ensureServerTick: () => undefined, kickServerTick: () => undefined }));
vi.mock("@/server/auth/require", () => ({
  requireSession: async () => {
    if (!state.user) throw new AppError("unauthorized", "session", "Sign in first.");
    return { user: state.user, sessionId: "s-test" };
  },
}));
const { POST } = await import("@/app/api/sync/push/route");
const { GET } = await import("@/app/api/sync/pull/route");

const ORIGIN = "http://localhost:3000";

function push(body: string, headers: Record<string, string> = {}) {
  return POST(
    new Request(`${ORIGIN}/api/sync/push`, {
      method: "POST",
      body,
      headers: { "content-type": "application/json", origin: ORIGIN, host: "localhost:3000", ...headers },
    }),
  );
}
async function count() {
  return (await state.db!.select({ id: entries.id }).from(entries)).length;
}

beforeEach(async () => {
  state.db = await freshDb({ seeded: true });
  state.user = tomasz;
  // The entries below come from tablet "tab-1", on which Tomasz and Grace have signed in online.
  await registeredDeviceId(state.db, [tomasz, grace]);
});

describe("POST /api/sync/push", () => {
  it("accepts a good batch, answers a retry identically, and is never cached", async () => {
    const batch = [note("a"), note("b")];
    const r1 = await push(JSON.stringify({ entries: batch }));
    expect(r1.status).toBe(200);
    expect(r1.headers.get("cache-control")).toBe("no-store");
    const a = (await r1.json()) as PushReply;
    expect(a.accepted.map((x) => x.id)).toEqual(batch.map((e) => e.id));
    const before = await count();
    const b = (await (await push(JSON.stringify({ entries: batch }))).json()) as PushReply;
    expect(b).toEqual(a);
    expect(await count()).toBe(before);
  });

  it("refuses garbage (400), a wrong content type (415), cross-origin (403), no session (401) and writes nothing", async () => {
    const before = await count();
    const garbage = await push("{not json");
    expect(garbage.status).toBe(400);
    expect(((await garbage.json()) as { error: { message: string } }).error.message).toMatch(/not valid JSON/);
    expect((await push(JSON.stringify([note("x")]))).status).toBe(400);
    expect((await push(JSON.stringify({ entries: "nope" }))).status).toBe(400);
    expect((await push(JSON.stringify({ entries: [note("x")] }), { "content-type": "text/plain" })).status).toBe(415);
    expect((await push(JSON.stringify({ entries: [note("x")] }), { origin: "http://evil.example" })).status).toBe(403);
    state.user = null;
    expect((await push(JSON.stringify({ entries: [note("x")] }))).status).toBe(401);
    expect(await count()).toBe(before);
  });

  it("answers 413 with a clear message over the entry count or the byte bound", async () => {
    const before = await count();
    const many = await push(
      JSON.stringify({ entries: Array.from({ length: PUSH_LIMITS.maxEntries + 1 }, (_, i) => note(`n${i}`)) }),
    );
    expect(many.status).toBe(413);
    expect(((await many.json()) as { error: { message: string } }).error.message).toContain(
      `at most ${PUSH_LIMITS.maxEntries} are accepted`,
    );
    const big = await push(
      JSON.stringify({ entries: [note("x".repeat(3000))], pad: "y".repeat(PUSH_LIMITS.maxBytes) }),
    );
    expect(big.status).toBe(413);
    expect(await count()).toBe(before);
  });

  it("refuses malformed and wrong-role entries one by one, without failing the good ones", async () => {
    state.user = grace;
    const good = note("safety walk", { authorId: "u-grace" });
    const wrongRole = {
      ...note("", { authorId: "u-grace" }),
      kind: "field.setting",
      payload: { currentA: 1, fieldT: 0.1, persistent: false },
    };
    const malformed = { ...note("x", { authorId: "u-grace" }), recordedAt: "yesterday" };
    const otherAuthor = note("not mine");
    const before = await count();
    const r = (await (
      await push(JSON.stringify({ entries: [good, wrongRole, malformed, otherAuthor, 42] }))
    ).json()) as PushReply;
    expect(r.accepted.map((a) => a.id)).toEqual([good.id]);
    const codes = Object.fromEntries(r.rejected.map((x) => [x.id, x.code]));
    expect(codes[wrongRole.id]).toBe("forbidden:kind");
    expect(codes[malformed.id]).toBe("bad_request:entry");
    expect(codes[otherAuthor.id]).toBe("forbidden:author");
    expect(codes["#4"]).toBe("bad_request:entry");
    expect(await count()).toBe(before + 1);
  });
});

describe("GET /api/sync/pull", () => {
  it("pages forward, sends reference data only when the tablet's copy is stale, hides what the role may not read", async () => {
    const audit = {
      ...note(""),
      authorId: "u-grace",
      kind: "audit.finding",
      payload: { targetEntryId: randomUUID(), verdict: "acceptable", findings: "ok" },
    };
    state.user = grace;
    await push(JSON.stringify({ entries: [audit] }));
    state.user = tomasz;
    const first = (await (await GET(new Request(`${ORIGIN}/api/sync/pull?since=0&ref=none`))).json()) as PullReply;
    expect(first.me.id).toBe("u-tomasz");
    expect(first.reference?.cryostats.map((c) => c.id).sort()).toEqual(["heron", "plover", "wren"]);
    const again = (await (
      await GET(new Request(`${ORIGIN}/api/sync/pull?since=0&ref=${first.reference!.hash}`))
    ).json()) as PullReply;
    expect(again.reference).toBeNull();
    let cursor = 0;
    const seen: string[] = [];
    for (;;) {
      const page = (await (
        await GET(new Request(`${ORIGIN}/api/sync/pull?since=${cursor}&limit=50`))
      ).json()) as PullReply;
      expect(page.cursor).toBeGreaterThanOrEqual(cursor);
      seen.push(...page.entries.map((e) => e.kind));
      cursor = page.cursor;
      if (!page.hasMore) break;
    }
    expect(seen.length).toBeGreaterThan(20);
    expect(seen).not.toContain("audit.finding");
    expect((await GET(new Request(`${ORIGIN}/api/sync/pull?since=-1`))).status).toBe(400);
  });
});

describe("the tablet after a refused push", () => {
  it("keeps its entries queued on a whole-batch 4xx, and marks (not drops) per-entry refusals", async () => {
    const tablet = await signedInTablet(tomasz, "t-refused");
    await recordEntriesIn(tablet, [noteDraft("kept")]);
    const refusing: Transport = {
      push: async () => {
        throw new TransportError("too_large", "too large", 413);
      },
      pull: nothingNew(tomasz),
    };
    // A single entry the server will not take at any size is kept, marked refused, with the reason.
    await syncOnce(tablet, refusing);
    expect(await tablet.entries.count()).toBe(1);
    expect((await tablet.entries.toArray())[0]?.sync).toBe("rejected");

    await recordEntriesIn(tablet, [noteDraft("kept too")]);
    const down: Transport = {
      ...refusing,
      push: async () => Promise.reject(new TransportError("bad_request", "bad", 400)),
    };
    await expect(syncOnce(tablet, down)).rejects.toThrow();
    expect(await tablet.outbox.count()).toBe(1);
    expect(await tablet.entries.where("sync").equals("pending").count()).toBe(1);
  });
});
