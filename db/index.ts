// The one database instance of the server process: PGlite on RIMELOG_DATA_DIR, locked against a
// second process, migrated, and seeded with the demo lab when empty. Cached on globalThis so that
// hot reload never opens the directory twice.
import { resolve } from "node:path";
import { env } from "@/lib/env";
import { type Db, openDb } from "./client";
import { lockDataDir } from "./lock";
import { seedIfEmpty } from "./seed";

type Holder = { promise?: Promise<Db>; release?: () => void };
const g = globalThis as unknown as { __rimelogDb?: Holder };
const holder: Holder = (g.__rimelogDb ??= {});

async function open(): Promise<Db> {
  const dir = resolve(env().RIMELOG_DATA_DIR);
  holder.release = lockDataDir(dir);
  try {
    const db = await openDb(dir);
    if (env().RIMELOG_SEED === "demo") await seedIfEmpty(db);
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
  } catch (e) {
    holder.release?.();
    throw e;
  }
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
