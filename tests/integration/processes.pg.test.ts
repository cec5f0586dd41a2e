// Several app processes on one PostgreSQL server (run with RIMELOG_TEST_DB=postgres only: PGlite
// has one process). Two Db instances on the same database, each its own connection pool, stand for
// two app processes: appends to the same cryostat at once keep one valid chain with no duplicate
// seq (the advisory lock in appendEntries), a push of the same entry through both is stored once,
// and the background tick runs in exactly one of them (the tick lease, db/lease.ts).
import { describe, expect, it, vi } from "vitest";
import type { Db } from "@/db/client";
import { holdsLease, nudgeLease } from "@/db/lease";
import { chainBreaks } from "@/db/queries/chain";
import { appendEntries } from "@/db/queries/entries";
import type { EntryInput } from "@/lib/schemas/entry";
import { checkpointKeys } from "@/server/audit/keys";
import { tickRound } from "@/server/tick";
import { note } from "../support/entries";
import { tomasz } from "../support/users";
import { ON_SERVER, openServer, serverDatabase } from "./fixture";

if (!ON_SERVER) throw new Error("processes.pg.test.ts runs on a PostgreSQL server only (RIMELOG_TEST_DB=postgres)");

async function twoProcesses(): Promise<[Db, Db]> {
  const name = await serverDatabase({ seeded: true });
  return [await openServer(name), await openServer(name)];
}

const count = async (db: Db, query: string) => (await db.$client.query<{ n: number }>(query)).rows[0]?.n ?? Number.NaN;

describe("two app processes on one PostgreSQL database", () => {
  it("appending to the same cryostat at once keeps one valid chain, no duplicate seq, a shared entry stored once", async () => {
    const [a, b] = await twoProcesses();
    const before = await count(a, "select count(*)::int as n from entries");
    const rounds = Array.from({ length: 8 }, (_, r) => {
      const shared = note(`both tablets sent this, round ${r}`, { deviceId: "tab-shared" });
      const batch = (device: string) => [
        ...Array.from({ length: 25 }, (_, i) => note(`${device} round ${r} #${i}`, { deviceId: device })),
        shared,
      ];
      return { a: batch("tab-a"), b: batch("tab-b"), shared };
    });
    // Every push of both processes at once: 16 transactions racing for the same chain.
    const replies = await Promise.all(
      rounds.flatMap((r) => [appendEntries(a, tomasz, r.a), appendEntries(b, tomasz, r.b)]),
    );
    expect(replies.flatMap((r) => r.rejected)).toEqual([]);
    const sent = new Set(rounds.flatMap((r) => [...r.a, ...r.b]).map((e: EntryInput) => e.id));
    const byId = new Map<string, string>();
    for (const acc of replies.flatMap((r) => r.accepted)) {
      const answer = `${acc.seq}:${acc.hash}`;
      // The same entry answered through both processes: the same seq and hash both times.
      expect(byId.get(acc.id) ?? answer).toBe(answer);
      byId.set(acc.id, answer);
    }
    expect(new Set(byId.keys())).toEqual(sent);
    const seqs = [...byId.values()].map((v) => Number(v.split(":")[0]));
    expect(new Set(seqs).size).toBe(sent.size);

    // Stored once each, no seq twice, and every chain (wren's above all) verifies with the project's check.
    expect(await count(a, "select count(*)::int as n from entries")).toBe(before + sent.size);
    expect(await count(b, "select (count(*) - count(distinct seq))::int as n from entries")).toBe(0);
    const breaks = await chainBreaks(b, { keys: checkpointKeys() });
    expect([...breaks.keys()]).toContain("wren");
    expect(Object.fromEntries(breaks)).toEqual(Object.fromEntries([...breaks.keys()].map((c) => [c, null])));
  });

  it("runs the background tick in exactly one process, and the other takes over when it stops", async () => {
    const [a, b] = await twoProcesses();
    const first = await Promise.all([tickRound(a), tickRound(b)]);
    expect(first.filter(Boolean)).toHaveLength(1);
    const [leader, other] = first[0] ? [a, b] : [b, a];
    for (let i = 0; i < 3; i++) {
      expect(await Promise.all([tickRound(leader), tickRound(other)])).toEqual([true, false]);
    }
    // The leader's rounds signed each chain head once; the other process signed nothing.
    const chains = await count(a, "select count(*)::int as n from chain_heads");
    expect(chains).toBeGreaterThan(0);
    expect(await count(a, "select count(*)::int as n from chain_checkpoints")).toBe(chains);

    await leader.$client.close(); // the process stops: its connection, and the lease with it, are gone
    expect(await tickRound(other)).toBe(true);
    expect(await tickRound(other)).toBe(true);
  });

  it("a kick in a process without the lease nudges the holder", async () => {
    const [a, b] = await twoProcesses();
    const nudged = vi.fn();
    expect(await holdsLease(a, "tick", nudged)).toBe(true);
    expect(await holdsLease(b, "tick")).toBe(false);
    await nudgeLease(b, "tick");
    await vi.waitFor(() => expect(nudged).toHaveBeenCalledTimes(1), { timeout: 5_000 });
  });
});
