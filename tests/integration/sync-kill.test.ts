// A pushed batch commits as a whole: a server process killed (SIGKILL) in the middle of a large
// push leaves no half-applied batch; after a restart the tablet's retry completes it and every
// entry is stored exactly once.
import { spawn } from "node:child_process";
import { writeFileSync } from "node:fs";
import { join } from "node:path";
import { asc, eq, inArray } from "drizzle-orm";
import { afterAll, describe, expect, it } from "vitest";
import { openDb } from "@/db/client";
import { toStoredRow } from "@/db/queries/stored";
import { entries } from "@/db/schema";
import { seedIfEmpty } from "@/db/seed";
import { type EntryDraft, recordEntriesIn } from "@/lib/local/store";
import { syncOnce } from "@/lib/sync/client";
import { genesisHash, linkHash } from "@/lib/sync/hash";
import { PUSH_LIMITS } from "@/lib/sync/protocol";
import { toInput } from "@/lib/sync/push";
import { applyPush } from "@/server/sync/apply";
import { testDirs } from "../support/dirs";
import { readingDraft } from "../support/entries";
import { inProcessServer, registeredTablet } from "../support/tablet";
import { tomasz } from "../support/users";

const dirs = testDirs("rimelog-kill-");
const work = dirs.root;
afterAll(() => dirs.remove());

describe("killed in the middle of a push", () => {
  it("keeps no half-applied batch, and the retry stores every entry exactly once", async () => {
    const dir = dirs.dataDir;
    const seeded = await openDb(dir);
    await seedIfEmpty(seeded);
    // The tablet, signed in online (registered with this server): 4 large batches of readings waiting in its outbox.
    const tablet = await registeredTablet(seeded, tomasz, "kill-tablet");
    await seeded.$client.close();

    const size = 250;
    for (let b = 0; b < 4; b++) {
      const drafts: EntryDraft[] = Array.from({ length: size }, (_, i) =>
        readingDraft({ cryostatId: b % 2 ? "heron" : "wren", quantity: "Still", stage: "still", value: 0.8 + i / 1e4 }),
      );
      await recordEntriesIn(tablet, drafts);
    }
    const all = (await tablet.outbox.toArray()).map((o) => o.entryId);
    const list = (await tablet.entries.bulkGet(all)).map((e) => toInput(e!));
    const pushes = Array.from({ length: 4 }, (_, b) => ({ entries: list.slice(b * size, (b + 1) * size) }));
    const batchFile = join(work, "batch.json");
    writeFileSync(batchFile, JSON.stringify({ user: tomasz, pushes }));

    // The server process applies the pushes; it is killed a moment into the third one.
    // node itself (not the tsx wrapper) so the SIGKILL hits the process that holds the database;
    // `react-server` lets db/queries import "server-only" outside Next.
    const child = spawn(
      process.execPath,
      [
        "--conditions",
        "react-server",
        "--import",
        "tsx",
        join(process.cwd(), "tests/integration/sync-kill.child.ts"),
        dir,
        batchFile,
      ],
      {
        cwd: process.cwd(),
        stdio: ["ignore", "pipe", "inherit"],
      },
    );
    const lines: string[] = [];
    const exited = new Promise<NodeJS.Signals | null>((resolve) => child.on("exit", (_c, s) => resolve(s)));
    await new Promise<void>((resolve, reject) => {
      let buf = "";
      child.stdout.on("data", (chunk: Buffer) => {
        buf += chunk.toString();
        const parts = buf.split("\n");
        buf = parts.pop() ?? "";
        for (const l of parts) {
          lines.push(l);
          if (l === "applying 2")
            setTimeout(() => {
              child.kill("SIGKILL");
              resolve();
            }, 40);
        }
      });
      child.on("exit", () => resolve());
      child.on("error", reject);
    });
    expect(await exited).toBe("SIGKILL");
    // It really died inside a push: the third push started and never finished.
    expect(lines).toContain("applied 1");
    expect(lines).not.toContain("applied 2");
    expect(lines).not.toContain("done");

    // Restart: each batch is either all there or not there at all.
    let db = await openDb(dir);
    const present = new Set(
      (
        await db
          .select({ id: entries.id })
          .from(entries)
          .where(
            inArray(
              entries.id,
              list.map((e) => e.id),
            ),
          )
      ).map((r) => r.id),
    );
    const perBatch = pushes.map((p) => p.entries.filter((e) => present.has(e.id)).length);
    expect(perBatch.slice(0, 2)).toEqual([size, size]);
    for (const n of perBatch) expect([0, size]).toContain(n);
    expect(perBatch.slice(2)).toEqual([0, 0]);

    // The tablet never heard back, so everything is still in its outbox; it retries after the restart.
    expect(await tablet.outbox.count()).toBe(4 * size);
    const { transport } = inProcessServer(() => db, tomasz);
    await syncOnce(tablet, transport, { maxBatch: size, maxBytes: PUSH_LIMITS.maxBytes });
    expect(await tablet.outbox.count()).toBe(0);
    expect(await tablet.entries.where("sync").notEqual("synced").count()).toBe(0);

    // And once more after another restart: a retry of everything changes nothing.
    await db.$client.close();
    db = await openDb(dir);
    const again = await applyPush(db, tomasz, { entries: list.slice(0, size) });
    expect(again.rejected).toEqual([]);
    const stored = await db
      .select({ id: entries.id })
      .from(entries)
      .where(
        inArray(
          entries.id,
          list.map((e) => e.id),
        ),
      );
    expect(stored.length).toBe(list.length);
    expect(new Set(stored.map((r) => r.id)).size).toBe(list.length);

    for (const chain of ["wren", "heron"]) {
      const rows = (await db.select().from(entries).where(eq(entries.chain, chain)).orderBy(asc(entries.seq))).map(
        toStoredRow,
      );
      let prev = genesisHash(chain);
      for (const e of rows) {
        expect(e.prevHash).toBe(prev);
        expect(linkHash(prev, e, e.seq, e.receivedAt)).toBe(e.hash);
        prev = e.hash;
      }
    }
    await db.$client.close();
    tablet.close();
  }, 180_000);
});
