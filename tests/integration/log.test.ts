// The append-only log on a real (in-memory) PGlite with the committed migrations.
import { describe, expect, it } from "vitest";
import { appendEntries, chainEntries, pullEntries } from "@/db/queries/entries";
import { genesisHash, linkHash } from "@/lib/sync/hash";
import { note } from "../support/entries";
import { tomasz } from "../support/users";
import { freshDb } from "./fixture";

describe("append-only log", () => {
  it("seeds the demo lab with a valid hash chain per cryostat", async () => {
    const db = await freshDb({ seeded: true });
    for (const chain of ["heron", "plover", "wren"]) {
      const list = await chainEntries(db, chain);
      expect(list.length).toBeGreaterThan(10);
      let prev = genesisHash(chain);
      for (const e of list) {
        expect(e.prevHash).toBe(prev);
        expect(linkHash(prev, e, e.seq, e.receivedAt)).toBe(e.hash);
        prev = e.hash;
      }
    }
  });

  it("refuses UPDATE and DELETE in the database itself", async () => {
    const db = await freshDb({ seeded: true });
    await expect(db.$client.query("update entries set kind = 'note'")).rejects.toThrow(/append-only/);
    await expect(db.$client.query("delete from entries")).rejects.toThrow(/append-only/);
    await expect(db.$client.query("truncate entries cascade")).rejects.toThrow(/append-only/);
  });

  it("answers a retried push with the same ids, seqs and hashes, and stores nothing twice", async () => {
    const db = await freshDb({ seeded: true });
    const batch = [note("first"), note("second")];
    const a = await appendEntries(db, tomasz, batch);
    const b = await appendEntries(db, tomasz, batch);
    expect(a.rejected).toEqual([]);
    expect(b).toEqual(a);
    const pulled = await pullEntries(db, { since: a.accepted[0]!.seq - 1, role: "technician" });
    expect(pulled.entries.map((e) => e.id)).toEqual(batch.map((e) => e.id));
  });

  it("rejects another author's entry and the same id with other content", async () => {
    const db = await freshDb({ seeded: true });
    const e = note("mine");
    await appendEntries(db, tomasz, [e]);
    const res = await appendEntries(db, tomasz, [
      { ...e, payload: { text: "changed" } },
      note("x", { authorId: "u-priya" }),
    ]);
    expect(res.accepted).toEqual([]);
    expect(res.rejected.map((r) => r.code)).toEqual(["conflict:entry", "forbidden:author"]);
  });
});
