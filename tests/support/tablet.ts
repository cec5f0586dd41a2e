// A fake tablet for the sync tests and the bench: the real tablet store (lib/local) on an
// in-memory IndexedDB (fake-indexeddb), registered with the server the way the real tablet does
// at sign-in (lib/sync/register.ts against server/devices/register.ts), and transports for the
// real sync client (lib/sync) — one that answers "nothing new", and one that hands each
// registration, push and pull to the server's own code in process, as JSON, the way they cross HTTP.
import { createHash } from "node:crypto";
import { IDBFactory, IDBKeyRange } from "fake-indexeddb";
import type { Db } from "@/db/client";
import { insertDevice } from "@/db/queries/devices";
import { AppError } from "@/lib/errors";
import { RimelogDexie } from "@/lib/local/db";
import { confirmSession } from "@/lib/local/store";
import type { SessionUser } from "@/lib/schemas/user";
import type { PullReply } from "@/lib/sync/protocol";
import { registerDevice } from "@/lib/sync/register";
import { type Transport, TransportError } from "@/lib/sync/transport";
import { registerDevice as serverRegister } from "@/server/devices/register";
import { applyPush, pullPage } from "@/server/sync/apply";
import { ENTRY_DEFAULTS } from "./entries";
import { tomasz } from "./users";

/**
 * A tablet store of its own. Pass the same `indexedDB` (and name) again to reopen one, as a
 * reloaded page or a restarted app would.
 */
export function fakeTablet(name = `t-${crypto.randomUUID()}`, indexedDB: IDBFactory = new IDBFactory()): RimelogDexie {
  return new RimelogDexie(name, { indexedDB, IDBKeyRange });
}

/**
 * A fresh tablet with `user` signed in (their session confirmed now) that no server in the test
 * knows: it holds a device id of its own, as if registered elsewhere. For tests that never push
 * to a server (or show what the server does with an unregistered id); else `registeredTablet`.
 */
export async function signedInTablet(
  user: SessionUser = tomasz,
  name?: string,
  indexedDB?: IDBFactory,
): Promise<RimelogDexie> {
  const tablet = fakeTablet(name, indexedDB);
  await tablet.setMeta("deviceId", `tab-elsewhere-${crypto.randomUUID()}`);
  await confirmSession(tablet, user);
  return tablet;
}

/** The registration call of the server on `db`, in process, for whoever `user` is (or says). */
export function inProcessRegister(
  db: Db | (() => Db),
  user: SessionUser | (() => SessionUser),
): NonNullable<Transport["register"]> {
  const dbNow = typeof db === "function" ? db : () => db;
  const who = typeof user === "function" ? user : () => user;
  return async (r) => {
    try {
      return wire(await serverRegister(dbNow(), who(), wire(r)));
    } catch (e) {
      // As lib/sync/http.ts reads the server's error answer: its status and code.
      if (!(e instanceof AppError)) throw e;
      throw new TransportError(e.status === 403 ? "forbidden" : "bad_request", e.message, e.status, e.code);
    }
  };
}

/**
 * A tablet signed in online as the real one is: registered with the server on `db` for `user`
 * (POST /api/devices, in process), then its session confirmed. Pass the same `indexedDB` and
 * name to reopen it; a tablet already registered is registered again (the user bound again).
 */
export async function registeredTablet(
  db: Db,
  user: SessionUser = tomasz,
  name?: string,
  indexedDB?: IDBFactory,
): Promise<RimelogDexie> {
  const tablet = fakeTablet(name, indexedDB);
  await signInOnline(tablet, db, user);
  return tablet;
}

/** `user` signs in on `tablet` while online: the tablet registers with the server on `db`, then confirms the session. */
export async function signInOnline(tablet: RimelogDexie, db: Db | (() => Db), user: SessionUser): Promise<void> {
  await registerDevice(tablet, { register: inProcessRegister(db, user) });
  await confirmSession(tablet, user);
}

/** What crosses HTTP: the value through JSON and back. */
export const wire = <T>(x: T): T => JSON.parse(JSON.stringify(x)) as T;

/** A pull that finds nothing new for `me`: no entries, the cursor where it was, no reference data. */
export function nothingNew(me: SessionUser): Transport["pull"] {
  return async (since): Promise<PullReply> => ({ entries: [], cursor: since, hasMore: false, reference: null, me });
}

/**
 * The server in process (registration, push and pull), for whoever `user` is (or says, when a function: it may change between
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
    register: inProcessRegister(dbNow, who),
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

/**
 * A tablet registered on `db` under a fixed id (default the entry builders' "tab-1") with `users`
 * signed in on it, for tests that push hand-made entries: what registration leaves in the
 * database, made directly (nobody holds its secret).
 */
export async function registeredDeviceId(
  db: Db,
  users: readonly [SessionUser, ...SessionUser[]],
  id: string = ENTRY_DEFAULTS.deviceId,
): Promise<string> {
  const ids = users.map((u) => u.id) as [string, ...string[]];
  await insertDevice(db, {
    id,
    secretHash: createHash("sha256").update(crypto.randomUUID()).digest("hex"),
    userIds: ids,
  });
  return id;
}
