import { join } from "node:path";
import { eq } from "drizzle-orm";
import { afterEach, beforeEach, describe, expect, it } from "vitest";
import type { Db } from "@/db/client";
import { checkChain, signChainHeads } from "@/db/queries/chain";
import { chainEntries } from "@/db/queries/entries";
import { toStoredRow } from "@/db/queries/stored";
import { chainCheckpoints, chainHeads, entries } from "@/db/schema";
import { verifyChain } from "@/lib/audit/chain";
import type { CheckpointKeys } from "@/lib/audit/checkpoint";
import { genesisHash, linkHash } from "@/lib/sync/hash";
import { fileCheckpointKeys, loadOrCreateKey, signCheckpoint } from "@/server/audit/keys";
import { type TestDirs, testDirs } from "../support/dirs";
import { freshDb } from "./fixture";

let db: Db;
let dirs: TestDirs;
let keys: CheckpointKeys;

beforeEach(async () => {
  db = await freshDb({ seeded: true });
  dirs = testDirs("rimelog-keys-");
  keys = fileCheckpointKeys(dirs.keyDir);
  await db.$client.exec("ALTER TABLE entries DISABLE TRIGGER USER");
});
afterEach(async () => {
  await db.$client.close();
  dirs.remove();
});

type Row = { id: string; seq: number; hash: string; prev_hash: string };
async function wren(): Promise<Row[]> {
  return (
    await db.$client.query<Row>(
      "SELECT id, seq::int AS seq, hash, prev_hash FROM entries WHERE chain = 'wren' ORDER BY seq",
    )
  ).rows;
}

describe("chain check", () => {
  it("verifies an untouched chain, with its signed checkpoint", async () => {
    await signChainHeads(db, { keys });
    const r = await checkChain(db, { chain: "wren", keys });
    expect(r.ok).toBe(true);
    expect(r.count).toBe((await wren()).length);
    expect(r.checkpointsChecked).toBe(1);
  });

  it("names a changed row", async () => {
    const rows = await wren();
    const target = rows[5]!;
    await db.$client.query(`UPDATE entries SET payload = jsonb_set(payload, '{percent}', '99') WHERE id = $1`, [
      target.id,
    ]);
    const r = await checkChain(db, { chain: "wren", keys });
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.kind).toBe("changed");
    expect(r.firstBad?.id).toBe(target.id);
    expect(r.lastGoodSeq).toBe(rows[4]!.seq);
  });

  it("names an inserted row", async () => {
    const rows = await wren();
    // Two neighbours in the chain with another chain's entry between them; seq numbers are global
    // and dense, so free one by moving that other entry to the end (it is on another chain).
    const at = rows.findIndex((r, i) => i > 0 && rows[i + 1] !== undefined && rows[i + 1]!.seq - r.seq > 1);
    const a = rows[at]!;
    const free = a.seq + 1;
    await db.$client.query("UPDATE entries SET seq = (SELECT max(seq) + 1000 FROM entries) WHERE seq = $1", [free]);
    const [src] = await db.select().from(entries).where(eq(entries.id, a.id));
    const forgedId = "00000000-0000-4000-8000-000000000001";
    const prev = "f".repeat(64);
    const forged = { ...toStoredRow(src!), id: forgedId, seq: free, payload: { percent: 77 } };
    const hash = linkHash(prev, forged, free, forged.receivedAt);
    await db
      .insert(entries)
      .values({ ...src!, id: forgedId, seq: free, payload: { percent: 77 }, prevHash: prev, hash });
    const r = await checkChain(db, { chain: "wren", keys });
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.kind).toBe("inserted");
    expect(r.firstBad?.id).toBe(forgedId);
  });

  it("names the entry after a deleted row", async () => {
    const rows = await wren();
    await db.$client.query("DELETE FROM entries WHERE id = $1", [rows[6]!.id]);
    const r = await checkChain(db, { chain: "wren", keys });
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.kind).toBe("deleted");
    expect(r.firstBad?.id).toBe(rows[7]!.id);
    expect(r.lastGoodSeq).toBe(rows[5]!.seq);
  });

  it("names reordered rows", async () => {
    const rows = await wren();
    const a = rows[2]!;
    const b = rows[3]!;
    // Swap the two sequence numbers (through a free temporary value: seq is unique).
    await db.$client.exec(
      `UPDATE entries SET seq = -1 WHERE id = '${a.id}'; UPDATE entries SET seq = ${a.seq} WHERE id = '${b.id}'; UPDATE entries SET seq = ${b.seq} WHERE id = '${a.id}';`,
    );
    const r = await checkChain(db, { chain: "wren", keys });
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.kind).toBe("reordered");
    expect(r.firstBad?.id).toBe(b.id);
  });

  it("names a truncated chain (the end removed) from the chain head", async () => {
    const rows = await wren();
    const last = rows.at(-1)!;
    await db.$client.query("DELETE FROM entries WHERE id = $1", [last.id]);
    const r = await checkChain(db, { chain: "wren", keys });
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.kind).toBe("truncated");
    expect(r.lastGoodSeq).toBe(rows.at(-2)!.seq);
    expect(r.message).toMatch(new RegExp(`head says seq ${last.seq}`));
  });

  it("catches a truncation hidden by moving the head back, through the signed checkpoint", async () => {
    await signChainHeads(db, { keys });
    const rows = await wren();
    const last = rows.at(-1)!;
    const prev = rows.at(-2)!;
    await db.$client.query("DELETE FROM entries WHERE id = $1", [last.id]);
    await db.$client.query("UPDATE chain_heads SET seq = $1, hash = $2 WHERE chain = 'wren'", [prev.seq, prev.hash]);
    const r = await checkChain(db, { chain: "wren", keys });
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.kind).toBe("truncated");
    expect(r.message).toMatch(/checkpoint/);
  });

  it("catches a wholly recomputed chain only with the signed checkpoint, even when the checkpoint rows are deleted", async () => {
    await signChainHeads(db, { keys });
    const rows = await wren();
    const target = rows[4]!;
    await db.$client.query(`UPDATE entries SET payload = jsonb_set(payload, '{percent}', '99') WHERE id = $1`, [
      target.id,
    ]);
    // Recompute every hash from the changed row on, as someone with database access could.
    const all = (
      await db.$client.query<Record<string, unknown>>("SELECT * FROM entries WHERE chain = 'wren' ORDER BY seq")
    ).rows;
    let prevHash = genesisHash("wren");
    const rewritten: { id: string; prev: string; hash: string }[] = [];
    for (const raw of all) {
      const e = toStoredRow({
        id: raw.id,
        chain: raw.chain,
        cryostatId: raw.cryostat_id,
        runId: raw.run_id,
        kind: raw.kind,
        payload: raw.payload,
        authorId: raw.author_id,
        deviceId: raw.device_id,
        recordedAt: new Date(raw.recorded_at as string),
        supersedes: raw.supersedes,
        reason: raw.reason,
        seq: Number(raw.seq),
        receivedAt: new Date(raw.received_at as string),
        prevHash: raw.prev_hash,
        hash: raw.hash,
      } as never);
      const hash = linkHash(prevHash, e, e.seq, e.receivedAt);
      rewritten.push({ id: e.id, prev: prevHash, hash });
      prevHash = hash;
    }
    // Unique prev_hash/hash: move every row to placeholders first, then write the new links.
    for (const [i, w] of rewritten.entries())
      await db.$client.query("UPDATE entries SET prev_hash = $1, hash = $2 WHERE id = $3", [
        `tmp-p-${i}`,
        `tmp-h-${i}`,
        w.id,
      ]);
    for (const w of rewritten)
      await db.$client.query("UPDATE entries SET prev_hash = $1, hash = $2 WHERE id = $3", [w.prev, w.hash, w.id]);
    await db.$client.query("UPDATE chain_heads SET hash = $1 WHERE chain = 'wren'", [prevHash]);
    await db.delete(chainCheckpoints);

    const r = await checkChain(db, { chain: "wren", keys });
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.kind).toBe("recomputed");
    expect(r.checkpointsChecked).toBe(1); // from the copy in the key directory
    // Without the checkpoint the recomputed chain would look whole: the signature is what catches it.
    const [head] = await db.select().from(chainHeads).where(eq(chainHeads.chain, "wren"));
    expect(verifyChain("wren", await chainEntries(db, "wren"), { head: head! }).ok).toBe(true);
  });

  it("does not trust a checkpoint signed with another key", async () => {
    const rows = await wren();
    const other = loadOrCreateKey(join(dirs.root, "other-keys"));
    const forged = signCheckpoint(other, { chain: "wren", seq: rows.at(-1)!.seq, hash: "0".repeat(64) });
    await db.insert(chainCheckpoints).values({
      chain: "wren",
      seq: forged.seq,
      hash: forged.hash,
      signature: forged.signature,
      publicKey: forged.publicKey,
      signedAt: new Date(forged.signedAt),
    });
    const r = await checkChain(db, { chain: "wren", keys });
    expect(r.ok).toBe(true);
    expect(r.untrustedCheckpoints).toBe(1);
  });

  it("signs a head again only after it moved", async () => {
    expect((await signChainHeads(db, { keys })).length).toBeGreaterThan(0);
    expect(await signChainHeads(db, { keys })).toEqual([]);
  });
});
