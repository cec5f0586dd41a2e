// The pull: entries after the tablet's cursor, page by page, each page written in one
// transaction with the reference data when the server sent a new copy; the offline session is
// renewed by every answer, and a different person signed in starts their view from zero.
import type { RimelogDexie, StoredLocalEntry } from "@/lib/local/db";
import type { StoredEntry } from "@/lib/schemas/entry";
import { recordHash } from "./hash";
import type { PullReply } from "./protocol";
import type { Transport } from "./transport";

function synced(e: StoredEntry): StoredLocalEntry {
  const { chain: _chain, ...rest } = e;
  return { ...rest, sync: "synced", rejection: null };
}

/** Pull every page after the tablet's cursor; returns how many entries came. */
export async function pullAll(db: RimelogDexie, transport: Transport, now: () => Date): Promise<number> {
  let cursor = (await db.getMeta("cursor")) ?? 0;
  let refHash: string | null = (await db.getMeta("refHash")) ?? "none";
  let n = 0;
  for (;;) {
    const reply = await transport.pull(cursor, refHash);
    refHash = null; // reference data is asked for on the first page only
    const applied = await applyPull(db, reply, now);
    if (applied.restart) {
      // Someone else is signed in now: start their view from the beginning.
      cursor = 0;
      refHash = "none";
      continue;
    }
    cursor = applied.cursor;
    n += reply.entries.length;
    if (!reply.hasMore) return n;
  }
}

/**
 * Apply one pull page in one transaction; returns the cursor, which never decreases while the
 * same person is signed in. A page for a different person than the tablet knew is not
 * applied: the previous view is forgotten and the pull restarts from zero.
 */
export async function applyPull(
  db: RimelogDexie,
  reply: PullReply,
  now: () => Date,
): Promise<{ cursor: number; restart: boolean }> {
  const stores = [db.entries, db.outbox, db.meta, db.cryostats, db.templates, db.calibrations, db.users];
  return db.transaction("rw", stores, async () => {
    const session = await db.getMeta("session");
    const at = now();
    // The offline session is renewed by every good contact; written again only when who it is
    // changed or a minute has passed, so a quiet round writes as little as it can.
    const same = session && JSON.stringify(session.user) === JSON.stringify(reply.me);
    if (!same || at.getTime() - Date.parse(session.confirmedAt) > 60_000) {
      await db.setMeta("session", { user: reply.me, confirmedAt: at.toISOString() });
    }
    if (session && session.user.id !== reply.me.id) {
      await forgetPulledData(db);
      return { cursor: 0, restart: true };
    }

    const ids = reply.entries.map((e) => e.id);
    const locals = await db.entries.bulkGet(ids);
    const put: StoredLocalEntry[] = [];
    const acknowledged: string[] = [];
    reply.entries.forEach((e, i) => {
      const local = locals[i];
      if (local && local.seq === null) {
        // Our own entry came back from the server: it is stored there, so it leaves the outbox.
        // Same id with other content would be a conflict: keep ours; its push gets the answer.
        if (recordHash(local) !== recordHash(e)) return;
        acknowledged.push(e.id);
      } else if (
        local &&
        local.sync === "synced" &&
        local.seq === e.seq &&
        local.hash === e.hash &&
        local.prevHash === e.prevHash &&
        local.receivedAt === e.receivedAt
      ) {
        return; // already held exactly so (its push answer carried the same link): nothing to write
      }
      put.push(synced(e));
    });
    if (put.length) await db.entries.bulkPut(put);
    if (acknowledged.length) await db.outbox.where("entryId").anyOf(acknowledged).delete();

    const before = (await db.getMeta("cursor")) ?? 0;
    const cursor = Math.max(before, reply.cursor);
    if (cursor !== before) await db.setMeta("cursor", cursor);

    const ref = reply.reference;
    if (ref) {
      await db.cryostats.clear();
      await db.cryostats.bulkPut(ref.cryostats);
      await db.templates.clear();
      await db.templates.bulkPut(ref.templates);
      // A server from before calibrations were part of the reference sends none: none are kept.
      await db.calibrations.clear();
      if (ref.calibrations?.length) await db.calibrations.bulkPut(ref.calibrations);
      await db.users.clear();
      await db.users.bulkPut(ref.users);
      await db.setMeta("rules", ref.rules);
      await db.setMeta("refHash", ref.hash);
    }
    return { cursor, restart: false };
  });
}

/**
 * Another person's session on this tablet: what was pulled for the previous user (their role's
 * view) goes; unsent and refused entries stay (they wait for their author's next sign-in).
 */
async function forgetPulledData(db: RimelogDexie): Promise<void> {
  await db.entries.where("sync").equals("synced").delete();
  await db.cryostats.clear();
  await db.templates.clear();
  await db.calibrations.clear();
  await db.users.clear();
  await db.meta.bulkDelete(["cursor", "refHash", "rules", "lastSuccess"]);
}
