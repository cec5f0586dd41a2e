// The tablet's push loop against the real server code: batches leave in order of writing while the
// previous answer is still being written, a 413 halves the batch from the same place, another
// person's queued rows in between are left alone, a failure half-way keeps every unanswered row
// queued, an answer kept as a receipt survives a crash before it reaches its entries, and rows
// queued by the schema-v2 app (no entry in the row) are still sent.
import Dexie from "dexie";
import { asc, eq } from "drizzle-orm";
import { IDBFactory, IDBKeyRange } from "fake-indexeddb";
import { beforeEach, describe, expect, it } from "vitest";
import type { Db } from "@/db/client";
import { toStoredRow } from "@/db/queries/stored";
import { devices, entries } from "@/db/schema";
import { SCHEMA_VERSIONS } from "@/lib/local/db";
import { queryEntries, queryEntry } from "@/lib/local/queries";
import type { EntryDraft } from "@/lib/local/store";
import { recordEntriesIn } from "@/lib/local/store";
import type { EntryInput } from "@/lib/schemas/entry";
import type { SessionUser } from "@/lib/schemas/user";
import { syncOnce } from "@/lib/sync/client";
import { applyPushReply, toInput } from "@/lib/sync/push";
import { type Transport, TransportError } from "@/lib/sync/transport";
import { applyPush, pullPage } from "@/server/sync/apply";
import { localEntry, note, readingDraft } from "../support/entries";
import { fakeTablet, inProcessRegister, signInOnline } from "../support/tablet";
import { priya, tomasz } from "../support/users";
import { freshDb } from "./fixture";

let db: Db;
let factory: IDBFactory;
beforeEach(async () => {
  db = await freshDb({ seeded: true });
  factory = new IDBFactory();
});

const tablet = (name = "t") => fakeTablet(name, factory);
/** `user` signs in on the tablet online (it registers with the server, as the real one does). */
const signIn = (t: ReturnType<typeof tablet>, user: SessionUser) => signInOnline(t, db, user);

function readings(n: number, tag: string): EntryDraft[] {
  return Array.from({ length: n }, (_, i) =>
    readingDraft({
      cryostatId: i % 2 ? "heron" : "wren",
      stage: "still",
      value: 0.7 + i / 1000,
      comment: `${tag} ${i}`,
    }),
  );
}

/** The server, in process, for whoever `who()` says is signed in; records what was sent. */
function server(
  who: () => SessionUser,
  opts: { maxEntries?: number; failOnPush?: number; encodeAhead?: boolean } = {},
) {
  const sent: EntryInput[][] = [];
  /** With encodeAhead: for each push, whether it came with a body made ahead, and the body's entries. */
  const bodies: { ahead: boolean; ids: string[] }[] = [];
  const transport: Transport = {
    register: inProcessRegister(() => db, who),
    ...(opts.encodeAhead ? { encodePush: (list: EntryInput[]) => JSON.stringify({ entries: list }) } : {}),
    async push(list, encoded) {
      if (opts.failOnPush !== undefined && sent.length === opts.failOnPush)
        throw new TransportError("offline", "The network went away.");
      if (opts.maxEntries !== undefined && list.length > opts.maxEntries)
        throw new TransportError("too_large", "Too many entries in one push.", 413);
      sent.push(list);
      // What the server gets is the body made ahead when there is one (as over HTTP).
      const body = typeof encoded === "string" ? encoded : JSON.stringify({ entries: list });
      if (opts.encodeAhead)
        bodies.push({
          ahead: typeof encoded === "string",
          ids: (JSON.parse(body) as { entries: EntryInput[] }).entries.map((e) => e.id),
        });
      return JSON.parse(JSON.stringify(await applyPush(db, who(), JSON.parse(body))));
    },
    async pull(since) {
      const page = await pullPage(db, who(), { since });
      return { ...page, reference: null, me: who() };
    },
  };
  return { transport, sent, bodies };
}

async function stored(ids: string[]) {
  const rows = await db.select().from(entries).orderBy(asc(entries.seq));
  const want = new Set(ids);
  return rows.filter((r) => want.has(r.id)).map(toStoredRow);
}

describe("pushing a long outbox", () => {
  it("sends in order of writing, each once, halves the batch on a 413, and ends with the server's copy on the tablet", async () => {
    const t = tablet();
    await signIn(t, tomasz);
    for (let b = 0; b < 5; b++) await recordEntriesIn(t, readings(9, `b${b}`));
    const written = (await t.outbox.orderBy("n").toArray()).map((r) => r.entryId);
    const { transport, sent } = server(() => tomasz, { maxEntries: 7 });

    const result = await syncOnce(t, transport, { maxBatch: 20 });
    expect(result.accepted).toBe(45);
    expect(sent.every((b) => b.length <= 7)).toBe(true);
    expect(sent.flat().map((e) => e.id)).toEqual(written); // in order, none twice
    expect(await t.outbox.count()).toBe(0);
    const server_ = await stored(written);
    expect(server_.map((e) => e.id)).toEqual(written); // the server's seq follows the tablet's order
    const local = await t.entries.bulkGet(written);
    for (const [i, e] of server_.entries()) {
      const { chain: _chain, ...copy } = e;
      expect(local[i]).toEqual({ ...copy, sync: "synced", rejection: null });
    }
  });

  it("sends each batch with the body the transport made ahead for exactly that batch, also after a 413", async () => {
    const t = tablet();
    await signIn(t, tomasz);
    for (let b = 0; b < 4; b++) await recordEntriesIn(t, readings(9, `b${b}`));
    const written = (await t.outbox.orderBy("n").toArray()).map((r) => r.entryId);
    const { transport, sent, bodies } = server(() => tomasz, { maxEntries: 7, encodeAhead: true });

    const result = await syncOnce(t, transport, { maxBatch: 20 });
    expect(result.accepted).toBe(36);
    expect(bodies.length).toBe(sent.length);
    expect(bodies.every((b) => b.ahead)).toBe(true);
    for (const [i, b] of bodies.entries()) expect(b.ids).toEqual(sent[i]!.map((e) => e.id)); // never another batch's body
    expect(sent.flat().map((e) => e.id)).toEqual(written);
    expect(await t.outbox.count()).toBe(0);
  });

  it("leaves another person's queued rows alone, even between this person's", async () => {
    const t = tablet();
    let who = tomasz;
    await signIn(t, tomasz);
    const a = await recordEntriesIn(t, readings(3, "tomasz-1"));
    // Priya signs in on the same tablet (her session, her entries), then Tomasz again.
    await signIn(t, priya);
    const p = await recordEntriesIn(t, readings(2, "priya"));
    await signIn(t, tomasz);
    const b = await recordEntriesIn(t, readings(3, "tomasz-2"));

    const { transport, sent } = server(() => who);
    await syncOnce(t, transport, { maxBatch: 50 });
    expect(sent.flat().map((e) => e.id)).toEqual([...a, ...b].map((e) => e.id));
    const left = await t.outbox.toArray();
    expect(left.map((r) => r.entryId)).toEqual(p.map((e) => e.id));
    expect((await t.entries.bulkGet(p.map((e) => e.id))).map((e) => e?.sync)).toEqual(["pending", "pending"]);

    // Her turn: she signs in, and her rows go with her session.
    who = priya;
    await signIn(t, priya);
    await syncOnce(t, transport, { maxBatch: 50 });
    expect(await t.outbox.count()).toBe(0);
    expect((await stored(p.map((e) => e.id))).map((e) => e.authorId)).toEqual(["u-priya", "u-priya"]);
  });

  it("keeps every unanswered row queued when the network fails half-way, and the next round finishes", async () => {
    const t = tablet();
    await signIn(t, tomasz);
    await recordEntriesIn(t, readings(40, "x"));
    const failing = server(() => tomasz, { failOnPush: 2 });
    await expect(syncOnce(t, failing.transport, { maxBatch: 10 })).rejects.toThrow("The network went away.");
    // Two batches answered (and written, even the one still being written when the third failed).
    expect(await t.outbox.count()).toBe(20);
    expect(await t.entries.where("sync").equals("synced").count()).toBe(20);
    expect(await t.receipts.count()).toBe(0); // written into their entries despite the failure

    const again = server(() => tomasz);
    await syncOnce(t, again.transport, { maxBatch: 10 });
    expect(await t.outbox.count()).toBe(0);
    expect(again.sent.flat()).toHaveLength(20);
    expect(await db.$count(entries, eq(entries.deviceId, (await t.getMeta("deviceId"))!))).toBe(40);
  });

  it("keeps an answer as a receipt until it is written into its entries; the next round writes one a crash left", async () => {
    const t = tablet("crash");
    await signIn(t, tomasz);
    const written = await recordEntriesIn(t, readings(5, "r"));
    // The answer arrives and its receipt commits with the outbox removal; then the tab dies.
    const rows = await t.outbox.orderBy("n").toArray();
    const list = rows.map((r) => r.entry!);
    const reply = await applyPush(db, tomasz, JSON.parse(JSON.stringify({ entries: list })));
    expect(await applyPushReply(t, reply, { rows, list }, () => new Date())).toEqual({ accepted: 5, rejected: 0 });
    expect(await t.outbox.count()).toBe(0); // nothing is pending: the server holds all five
    expect(await t.receipts.count()).toBe(1);
    expect((await t.entries.bulkGet(written.map((e) => e.id))).map((e) => e?.sync)).toEqual(Array(5).fill("pending"));
    // The screens read them as sent already (no outbox row), in step with the pending count.
    const shown = [
      ...(await queryEntries(t, { cryostatId: "wren" })),
      ...(await queryEntries(t, { cryostatId: "heron", limit: 10 })),
    ];
    expect(shown.map((e) => e.sync)).toEqual(Array(5).fill("synced"));
    expect((await queryEntry(t, written[0]!.id))?.sync).toBe("synced");
    // Meanwhile one entry is gone from the tablet: folding the receipt must not bring it back
    // half-made (the round's pull brings the server's copy instead).
    await t.entries.delete(written[4]!.id);
    t.close();

    const again = tablet("crash");
    const { transport, sent } = server(() => tomasz);
    await syncOnce(again, transport);
    expect(sent).toHaveLength(0); // nothing sent twice
    expect(await again.receipts.count()).toBe(0);
    const server_ = await stored(written.map((e) => e.id));
    const local = await again.entries.bulkGet(written.map((e) => e.id));
    expect(local[4]?.sync).toBe("synced"); // brought back by the round's pull, as the server holds it
    for (const [i, e] of server_.entries()) {
      const { chain: _chain, ...copy } = e;
      expect(local[i]).toEqual({ ...copy, sync: "synced", rejection: null });
    }
  });

  it("sends rows queued by the schema-v2 app, which carry no copy of their entry", async () => {
    // The store as version 2 of the app left it: the entry in `entries`, a bare row in `outbox`.
    const old = new Dexie("upgrade", { indexedDB: factory, IDBKeyRange });
    for (const [version, stores] of SCHEMA_VERSIONS.filter(([v]) => v <= 2)) old.version(version).stores(stores);
    const e = note("written before the update", { deviceId: "tab-old" });
    // Its device id reached the server with an earlier push, before tablets registered: the
    // server holds it without a secret, and its user adopts it at the first round.
    await db.insert(devices).values({ id: "tab-old", userId: tomasz.id });
    await old.table("meta").put({ key: "deviceId", value: "tab-old" });
    await old.table("entries").add(localEntry(e));
    await old.table("outbox").add({ entryId: e.id, authorId: tomasz.id, queuedAt: e.recordedAt, bytes: 300 });
    await old.table("meta").put({ key: "session", value: { user: tomasz, confirmedAt: new Date().toISOString() } });
    old.close();

    const t = tablet("upgrade");
    const { transport, sent } = server(() => tomasz);
    await syncOnce(t, transport);
    expect(sent.flat()).toEqual([e]);
    expect(await t.outbox.count()).toBe(0);
    expect((await t.entries.get(e.id))?.sync).toBe("synced");
    expect(toInput((await t.entries.get(e.id))!)).toEqual(e);
  });
});
