// The append-only log: applying a pushed batch (idempotent, one transaction, hash-chained per
// cryostat), reading a cryostat's logbook page, and pulling what changed since a cursor.
import { createHash } from "node:crypto";
import { and, desc, eq, getTableColumns, gt, inArray, lt, notInArray, sql } from "drizzle-orm";
import type { Db } from "@/db/client";
import { LOCK_SPACE, LOCKS } from "@/db/locks";
import { chainHeads, cryostats, devices, entries, users } from "@/db/schema";
import { mayRead, maySign, readableKindsExcluded } from "@/lib/auth/permissions";
import { placeRefusal, textRefusal, timeRefusal } from "@/lib/record/rules";
import type { EntryInput, StoredEntry } from "@/lib/schemas/entry";
import type { SessionUser } from "@/lib/schemas/user";
import { chainOf, genesisHash, linkText, recordHash } from "@/lib/sync/hash";
import type { Accepted, PushReply as PushResult, Rejected } from "@/lib/sync/protocol";
import { checkedAgainstLog, runProjectors, validateAgainstLog } from "./projections";
import { toStoredRow } from "./stored";

export type { Accepted, PushResult, Rejected };

const entryColumns = Object.entries(getTableColumns(entries));

/** A row keyed by column name (what json_populate_recordset expects), dates as ISO text. */
export function toColumns(row: typeof entries.$inferInsert): Record<string, unknown> {
  const out: Record<string, unknown> = {};
  for (const [key, column] of entryColumns) {
    const v = (row as Record<string, unknown>)[key];
    out[column.name] = v instanceof Date ? v.toISOString() : (v ?? null);
  }
  return out;
}

/**
 * Apply a batch of parsed entries for one signed-in user. The whole batch commits in one
 * transaction; an entry already stored with the same content is answered as accepted again
 * (a retried push changes nothing); a bad entry is rejected without blocking the others.
 */
export async function appendEntries(
  db: Db,
  user: SessionUser,
  batch: EntryInput[],
  {
    importAuthors,
    now = new Date(),
  }: {
    /** Import and demo seeding only: entries may carry these other authors, each checked in their own role. */
    importAuthors?: Map<string, SessionUser>;
    /** The server's clock (tests set it): receivedAt, and what "ahead of the server's clock" means. */
    now?: Date;
  } = {},
): Promise<PushResult> {
  return db.transaction(async (tx) => {
    const t = tx as unknown as Db;
    // Appends wait for each other here until commit, across processes too (db/locks.ts): seq is global.
    await t.execute(sql`select pg_advisory_xact_lock(${LOCK_SPACE}, ${LOCKS.append})`);
    const accepted: Accepted[] = [];
    const rejected: Rejected[] = [];
    if (batch.length === 0) return { accepted, rejected };

    const ids = batch.map((e) => e.id);
    // The ids as one JSON parameter, not one bound parameter each (a push may carry 2,000).
    const existing = await t
      .select()
      .from(entries)
      .where(sql`${entries.id} in (select json_array_elements_text(${JSON.stringify(ids)}::json)::uuid)`);
    const existingById = new Map(existing.map((r) => [r.id, r]));

    const deviceIds = [...new Set(batch.map((e) => e.deviceId))];
    const revoked = new Set(
      (
        await t
          .select({ id: devices.id, revokedAt: devices.revokedAt })
          .from(devices)
          .where(inArray(devices.id, deviceIds))
      )
        .filter((d) => d.revokedAt)
        .map((d) => d.id),
    );
    const cryostatById = new Map(
      (await t.select({ id: cryostats.id, name: cryostats.name, config: cryostats.config }).from(cryostats)).map(
        (c) => [c.id, c],
      ),
    );

    const [{ maxSeq } = { maxSeq: 0 }] = await t
      .select({ maxSeq: sql<number>`coalesce(max(${entries.seq}), 0)::int` })
      .from(entries);
    let seq = Number(maxSeq);
    const heads = new Map((await t.select().from(chainHeads)).map((h) => [h.chain, h.hash]));
    const touched = new Map<string, { seq: number; hash: string }>();
    const rows: (typeof entries.$inferInsert)[] = [];
    const written: StoredEntry[] = []; // the same rows as the projectors read them
    const seenInBatch = new Map<string, EntryInput>();
    const receivedAt = now;

    for (const [index, e] of batch.entries()) {
      const reject = (code: string, message: string) => rejected.push({ id: e.id, code, message });
      const stored = existingById.get(e.id);
      if (stored) {
        if (recordHash(toStoredRow(stored)) === recordHash(e))
          accepted.push({
            id: e.id,
            seq: stored.seq,
            hash: stored.hash,
            prevHash: stored.prevHash,
            receivedAt: stored.receivedAt.toISOString(),
          });
        else reject("conflict:entry", "Another entry with this id is already stored with different content.");
        continue;
      }
      const dup = seenInBatch.get(e.id);
      if (dup) {
        if (recordHash(dup) !== recordHash(e))
          reject("conflict:entry", "The batch holds two different entries with this id.");
        continue; // answered with the first copy below
      }
      const actor = e.authorId === user.id ? user : importAuthors?.get(e.authorId);
      if (!actor) {
        reject(
          "forbidden:author",
          "This entry was written by another user; it can only be sent from that user's session.",
        );
        continue;
      }
      if (revoked.has(e.deviceId)) {
        reject(
          "forbidden:device",
          "This tablet has been withdrawn by the facility admin; its entries are not accepted.",
        );
        continue;
      }
      // The record rules that need no look at the log (lib/record/rules.ts).
      const plain =
        textRefusal(e) ??
        timeRefusal(e, receivedAt.getTime()) ??
        placeRefusal(e, actor, e.cryostatId === null ? null : (cryostatById.get(e.cryostatId) ?? null));
      if (plain) {
        reject(plain.code, plain.message);
        continue;
      }
      if (e.kind === "signature") {
        const meaning = e.payload.meaning;
        if (!maySign(actor.role, meaning)) {
          reject("forbidden:signature", `A ${actor.role.replace("_", " ")} may not sign as "${meaning}".`);
          continue;
        }
      }
      const problem = checkedAgainstLog(e)
        ? await validateAgainstLog(t, e, seenInBatch, actor, batch.slice(index + 1))
        : null;
      if (problem) {
        reject(problem.code, problem.message);
        continue;
      }

      seq += 1;
      const chain = chainOf(e.cryostatId);
      const prevHash = touched.get(chain)?.hash ?? heads.get(chain) ?? genesisHash(chain);
      const at = receivedAt.toISOString();
      // node's native SHA-256 (a tenth of the pure-JS one's time; a push may carry 2,000 entries).
      const hash = createHash("sha256")
        .update(linkText(prevHash, e, seq, at))
        .digest("hex");
      touched.set(chain, { seq, hash });
      seenInBatch.set(e.id, e);
      rows.push({ ...e, recordedAt: new Date(e.recordedAt), chain, seq, receivedAt, prevHash, hash });
      written.push({ ...e, chain, seq, receivedAt: at, prevHash, hash });
      accepted.push({ id: e.id, seq, hash, prevHash, receivedAt: at });
    }

    // One statement for the batch: the rows travel as one JSON parameter and PostgreSQL unpacks
    // them (json_populate_recordset), which costs far less than thousands of bound parameters.
    if (rows.length) {
      const records = JSON.stringify(rows.map(toColumns));
      await t.execute(
        sql`insert into ${entries} select * from json_populate_recordset(null::${entries}, ${records}::json) on conflict (id) do nothing`,
      );
    }
    for (const [chain, head] of touched) {
      await t
        .insert(chainHeads)
        .values({ chain, ...head })
        .onConflictDoUpdate({ target: chainHeads.chain, set: head });
    }
    if (written.length) await runProjectors(t, written);
    return { accepted, rejected };
  });
}

/** A cryostat's logbook, newest first, paged by seq. */
export async function listCryostatEntries(
  db: Db,
  {
    cryostatId,
    role,
    cursor,
    limit = 30,
  }: { cryostatId: string; role: SessionUser["role"]; cursor?: number; limit?: number },
) {
  const hidden = readableKindsExcluded(role);
  const rows = await db
    .select()
    .from(entries)
    .where(
      and(
        eq(entries.cryostatId, cryostatId),
        cursor ? lt(entries.seq, cursor) : undefined,
        hidden.length ? notInArray(entries.kind, hidden) : undefined,
      ),
    )
    .orderBy(desc(entries.seq))
    .limit(limit + 1);
  const page = rows.slice(0, limit).map(toStoredRow);
  const last = page.at(-1);
  const authorIds = [...new Set(page.map((e) => e.authorId))];
  const names = authorIds.length
    ? await db.select({ id: users.id, name: users.name }).from(users).where(inArray(users.id, authorIds))
    : [];
  return {
    entries: page,
    names: Object.fromEntries(names.map((n) => [n.id, n.name])),
    nextCursor: rows.length > limit && last ? last.seq : null,
  };
}

/** Entries after a cursor, oldest first, filtered to what the role may read. */
export async function pullEntries(
  db: Db,
  { since, role, limit = 500 }: { since: number; role: SessionUser["role"]; limit?: number },
) {
  const rows = await db
    .select()
    .from(entries)
    .where(gt(entries.seq, since))
    .orderBy(entries.seq)
    .limit(limit + 1);
  const page = rows.slice(0, limit);
  const last = page.at(-1);
  return {
    // The cursor moves past hidden entries too, so it only ever moves forward.
    entries: page.filter((r) => mayRead(role, r.kind)).map(toStoredRow),
    cursor: last ? last.seq : since,
    hasMore: rows.length > limit,
  };
}

/** Every entry of one chain in order, for verification. */
export async function chainEntries(db: Db, chain: string) {
  return (await db.select().from(entries).where(eq(entries.chain, chain)).orderBy(entries.seq)).map(toStoredRow);
}

export async function getEntry(db: Db, id: string) {
  const [row] = await db.select().from(entries).where(eq(entries.id, id));
  return row ? toStoredRow(row) : undefined;
}
