// The tablet store's write path on fake-indexeddb: one transaction for entry + outbox row,
// validation and session checks before anything is written, photos kept as blobs.
import { describe, expect, it } from "vitest";
import { queryEntries, syncSummary } from "@/lib/local/queries";
import {
  confirmSession,
  type EntryDraft,
  LocalWriteError,
  OFFLINE_SESSION_MS,
  putAttachmentIn,
  recordEntriesIn,
} from "@/lib/local/store";
import { entryInput, localEntry, noteDraft } from "../support/entries";
import { fakeTablet } from "../support/tablet";
import { grace, priya, tomasz } from "../support/users";

/** The id the server issued to this tablet at its online sign-in (lib/sync/register.ts keeps it). */
const REGISTERED = "tab-issued-by-the-server";

/** A tablet store that has registered with the server (as every tablet does before its first session). */
async function tablet() {
  const db = fakeTablet();
  await db.setMeta("deviceId", REGISTERED);
  return db;
}

describe("tablet store: recording", () => {
  it("writes the entry and its outbox row together, stamped with author, device and time", async () => {
    const db = await tablet();
    await confirmSession(db, tomasz);
    const [e] = await recordEntriesIn(db, [
      { cryostatId: "wren", kind: "reading", payload: { quantity: "4 K plate", stage: "4k", value: 3.9, unit: "K" } },
    ]);
    expect(e?.authorId).toBe("u-tomasz");
    expect(e?.deviceId).toBe(REGISTERED);
    expect(e?.sync).toBe("pending");
    expect(new Date(e!.recordedAt).toISOString()).toBe(e!.recordedAt);
    const out = await db.outbox.toArray();
    expect(out.map((o) => o.entryId)).toEqual([e!.id]);
    expect((await queryEntries(db, { cryostatId: "wren" })).map((x) => x.id)).toEqual([e!.id]);
    expect((await syncSummary(db)).pending).toBe(1);
  });

  it("writes nothing when one of several drafts is invalid (all or none)", async () => {
    const db = await tablet();
    await confirmSession(db, tomasz);
    const bad = recordEntriesIn(db, [
      noteDraft("fine"),
      { cryostatId: "wren", kind: "helium.level", payload: { percent: 140 } },
    ]);
    await expect(bad).rejects.toBeInstanceOf(LocalWriteError);
    await expect(bad).rejects.toMatchObject({ code: "invalid" });
    expect(await db.entries.count()).toBe(0);
    expect(await db.outbox.count()).toBe(0);
  });

  it("refuses to record without a session, after the offline bound, or for a kind the role may not write", async () => {
    const db = await tablet();
    await expect(recordEntriesIn(db, [noteDraft("x")])).rejects.toMatchObject({ code: "no_session" });
    await confirmSession(db, tomasz, new Date(Date.now() - OFFLINE_SESSION_MS - 60_000));
    await expect(recordEntriesIn(db, [noteDraft("x")])).rejects.toMatchObject({ code: "session_expired" });
    await confirmSession(db, tomasz);
    await expect(
      recordEntriesIn(db, [
        {
          cryostatId: "wren",
          kind: "audit.finding",
          payload: { targetEntryId: crypto.randomUUID(), verdict: "acceptable", findings: "" },
        },
      ]),
    ).rejects.toMatchObject({ code: "forbidden" });
    expect(await db.entries.count()).toBe(0);
  });

  it("refuses to record on a tablet that holds no registration, and writes nothing", async () => {
    const db = fakeTablet();
    await confirmSession(db, tomasz);
    await expect(recordEntriesIn(db, [noteDraft("x")])).rejects.toMatchObject({ code: "no_device" });
    expect(await db.entries.count()).toBe(0);
    expect(await db.outbox.count()).toBe(0);
    expect(await db.getMeta("deviceId")).toBeUndefined();
  });

  it("stamps each write for whoever is signed in now, even right after someone else wrote", async () => {
    // A write goes out prepared for the previous writer and is checked inside its transaction.
    const db = await tablet();
    const note = (text: string) => [noteDraft(text)];
    await confirmSession(db, tomasz);
    const [a] = await recordEntriesIn(db, note("tomasz"));
    await confirmSession(db, priya);
    const [b] = await recordEntriesIn(db, note("priya"));
    expect([a!.authorId, b!.authorId]).toEqual(["u-tomasz", "u-priya"]);
    // The safety officer signs in on the same tablet: a magnet setting, Priya's to record, is not hers.
    await confirmSession(db, grace);
    const field = [
      { cryostatId: "wren", kind: "field.setting", payload: { currentA: 10, fieldT: 1, persistent: false } },
    ] as EntryDraft[];
    await expect(recordEntriesIn(db, field)).rejects.toMatchObject({ code: "forbidden" });
    // The session ran out, then nobody is signed in: refused, and nothing half-written.
    await confirmSession(db, priya, new Date(Date.now() - OFFLINE_SESSION_MS - 60_000));
    await expect(recordEntriesIn(db, note("late"))).rejects.toMatchObject({ code: "session_expired" });
    await db.meta.delete("session");
    await expect(recordEntriesIn(db, note("nobody"))).rejects.toMatchObject({ code: "no_session" });
    // Another device id (the store was reset): the write carries the one the store names.
    await confirmSession(db, priya);
    await db.setMeta("deviceId", "tab-replaced");
    const [c] = await recordEntriesIn(db, note("new device"));
    expect(c!.deviceId).toBe("tab-replaced");
    expect((await db.entries.toArray()).map((e) => e.authorId).sort()).toEqual(["u-priya", "u-priya", "u-tomasz"]);
    expect(await db.outbox.count()).toBe(3);
  });

  it("keeps a photo for upload and refuses an empty one", async () => {
    const db = await tablet();
    await confirmSession(db, tomasz);
    const id = await putAttachmentIn(db, new Blob([new Uint8Array([0xff, 0xd8, 0xff, 0xe0, 1, 2, 3])]), {
      fileName: "gauge.jpg",
      mime: "image/jpeg",
    });
    const row = await db.attachments.get(id);
    expect(row?.state).toBe("pending");
    expect(row?.bytes).toBe(7);
    await expect(putAttachmentIn(db, new Blob([]), { fileName: "x.jpg", mime: "image/jpeg" })).rejects.toMatchObject({
      code: "invalid",
    });
  });
});

describe("tablet store: reading a cryostat's newest entries", () => {
  it("gives unsent entries first, then synced ones by server order, without the rest of the log", async () => {
    const db = await tablet();
    await confirmSession(db, tomasz);
    const synced = Array.from({ length: 30 }, (_, i) =>
      localEntry(
        entryInput(
          {
            cryostatId: i % 2 ? "wren" : "heron",
            kind: "note",
            payload: { text: `s${i}` },
            authorId: priya.id,
            deviceId: "tab-p",
          },
          new Date(Date.UTC(2026, 10, 1, 0, i)),
        ),
        { seq: 100 + i, hash: "h", prevHash: "p", receivedAt: new Date().toISOString() },
      ),
    );
    await db.entries.bulkPut(synced);
    const [mine] = await recordEntriesIn(db, [noteDraft("unsent")]);
    const got = await queryEntries(db, { cryostatId: "wren", limit: 4 });
    expect(got.map((e) => e.id)).toEqual([mine!.id, synced[29]!.id, synced[27]!.id, synced[25]!.id]);
    const all = await queryEntries(db, { cryostatId: "wren" });
    expect(all.length).toBe(16);
    expect(all.slice(0, 4).map((e) => e.id)).toEqual(got.map((e) => e.id));
  });
});

describe("tablet store: reading entries of some kinds", () => {
  it("reads them by kind (per cryostat, across cryostats, or facility-wide), newest first", async () => {
    const db = await tablet();
    await confirmSession(db, tomasz);
    const at = (i: number) => new Date(Date.UTC(2026, 10, 2, 0, i));
    const reading = { quantity: "Temperature", stage: "still", value: 0.8, unit: "K" };
    const plan = [
      ["wren", "note"],
      ["wren", "reading"],
      ["heron", "reading"],
      [null, "note"],
      ["wren", "reading"],
    ] as const;
    const written: { id: string }[] = [];
    for (const [i, [cryostatId, kind]] of plan.entries()) {
      const [e] = await recordEntriesIn(
        db,
        [{ cryostatId, kind, payload: kind === "note" ? { text: `n${i}` } : reading } as EntryDraft],
        at(i),
      );
      written.push(e!);
    }
    const ids = (xs: { id: string }[]) => xs.map((e) => e.id);
    const w = (...is: number[]) => is.map((i) => written[i]!.id);
    expect(ids(await queryEntries(db, { cryostatId: "wren", kinds: ["reading"] }))).toEqual(w(4, 1));
    expect(ids(await queryEntries(db, { cryostatId: "wren", kinds: ["reading"], limit: 1 }))).toEqual(w(4));
    expect(ids(await queryEntries(db, { kinds: ["reading"] }))).toEqual(w(4, 2, 1));
    expect(ids(await queryEntries(db, { cryostatId: null, kinds: ["note"] }))).toEqual(w(3));
    expect(ids(await queryEntries(db, { cryostatId: "wren", kinds: ["note", "reading"] }))).toEqual(w(4, 1, 0));
    expect(ids(await queryEntries(db, { cryostatId: "heron", kinds: ["note"] }))).toEqual([]);
  });
});
