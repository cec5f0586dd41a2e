// A fake tablet for the sync tests and the bench: the real tablet store (lib/local) on an
// in-memory IndexedDB (fake-indexeddb), and transports for the real sync client (lib/sync) —
// one that answers "nothing new", and one that hands each push and pull to the server's own sync
// code (server/sync/apply.ts) in process, as JSON, the way they cross HTTP.
import { IDBFactory, IDBKeyRange } from "fake-indexeddb";
import type { Db } from "@/db/client";
import { RimelogDexie } from "@/lib/local/db";
import { confirmSession } from "@/lib/local/store";
import type { SessionUser } from "@/lib/schemas/user";
import type { PullReply } from "@/lib/sync/protocol";
import type { Transport } from "@/lib/sync/transport";
import { applyPush, pullPage } from "@/server/sync/apply";
import { tomasz } from "./users";

/**
 * A tablet store of its own. Pass the same `indexedDB` (and name) again to reopen one, as a
 * reloaded page or a restarted app would.
 */
export function fakeTablet(name = `t-${crypto.randomUUID()}`, indexedDB: IDBFactory = new IDBFactory()): RimelogDexie {
  return new RimelogDexie(name, { indexedDB, IDBKeyRange });
}

/** A fresh tablet with `user` signed in (their session confirmed now). */
export async function signedInTablet(
  user: SessionUser = tomasz,
  name?: string,
  indexedDB?: IDBFactory,
): Promise<RimelogDexie> {
  const tablet = fakeTablet(name, indexedDB);
  await confirmSession(tablet, user);
  return tablet;
}

/** What crosses HTTP: the value through JSON and back. */
export const wire = <T>(x: T): T => JSON.parse(JSON.stringify(x)) as T;

/** A pull that finds nothing new for `me`: no entries, the cursor where it was, no reference data. */
export function nothingNew(me: SessionUser): Transport["pull"] {
  return async (since): Promise<PullReply> => ({ entries: [], cursor: since, hasMore: false, reference: null, me });
}

/**
 * The server in process, for whoever `user` is (or says, when a function: it may change between
 * rounds) on the database `db` gives (a function when a test re-opens it). `pull: "nothing-new"`
 * leaves pulls out (the bench's push figure). `stats` counts the pushes and the server's own time
 * in `applyPush`.
 */
export function inProcessServer(
  db: Db | (() => Db),
  user: SessionUser | (() => SessionUser),
  opts: { pull?: "server" | "nothing-new"; pullLimit?: number } = {},
): { transport: Transport; stats: { pushes: number; applyMs: number } } {
  const dbNow = typeof db === "function" ? db : () => db;
  const who = typeof user === "function" ? user : () => user;
  const stats = { pushes: 0, applyMs: 0 };
  const transport: Transport = {
    async push(list) {
      const body = wire({ entries: list });
      const t0 = performance.now();
      const reply = await applyPush(dbNow(), who(), body);
      stats.applyMs += performance.now() - t0;
      stats.pushes += 1;
      return wire(reply);
    },
    pull:
      opts.pull === "nothing-new"
        ? (since, refHash) => nothingNew(who())(since, refHash)
        : async (since) =>
            wire({
              ...(await pullPage(dbNow(), who(), { since, ...(opts.pullLimit ? { limit: opts.pullLimit } : {}) })),
              reference: null,
              me: who(),
            }),
  };
  return { transport, stats };
}
