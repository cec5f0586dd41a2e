// The one database instance of the server process, cached on globalThis so that hot reload never
// opens it twice. With DATABASE_URL: a PostgreSQL server (pg.ts), which several app processes may
// share. Without: PGlite on RIMELOG_DATA_DIR, locked against a second process. Either way migrated,
// and seeded with the demo lab when empty and RIMELOG_SEED=demo. The driver is chosen here only.
import { resolve } from "node:path";
import { env } from "@/lib/env";
import { type Db, openDb } from "./client";
import { lockDataDir } from "./lock";
import { seedIfEmpty } from "./seed";

type Holder = { promise?: Promise<Db>; release?: () => void };
const g = globalThis as unknown as { __rimelogDb?: Holder };
const holder: Holder = (g.__rimelogDb ??= {});

const seed = (db: Db) => (env().RIMELOG_SEED === "demo" ? seedIfEmpty(db) : Promise.resolve(false));

async function openServer(url: string): Promise<Db> {
  // Imported only here, so the embedded default never loads node-postgres.
  const { openServerDb } = await import("./pg");
  // The seed runs under the migration lock: two processes starting on an empty database seed it once.
  return openServerDb(url, { max: env().RIMELOG_DB_POOL, whileLocked: seed });
}

async function openEmbedded(): Promise<Db> {
  const dir = resolve(env().RIMELOG_DATA_DIR);
  holder.release = lockDataDir(dir);
  try {
    const db = await openDb(dir);
    await seed(db);
    return db;
  } catch (e) {
    holder.release?.();
    throw e;
  }
}

async function open(): Promise<Db> {
  const url = env().DATABASE_URL;
  const db = url ? await openServer(url) : await openEmbedded();
  const close = () => {
    void db.$client
      .close()
      .catch(() => undefined)
      .finally(() => {
        holder.release?.();
        process.exit(0);
      });
  };
  process.once("SIGTERM", close);
  process.once("SIGINT", close);
  process.once("exit", () => holder.release?.());
  return db;
}

export function getDb(): Promise<Db> {
  if (!holder.promise) {
    holder.promise = open().catch((e) => {
      // Do not cache a failure: the next request tries again.
      holder.promise = undefined;
      throw e;
    });
  }
  return holder.promise;
}

export type { Db };
