// Opening the database through Drizzle and applying the committed migrations. Two drivers share
// one schema, one migrations folder and one set of queries: PGlite (embedded, the default; this
// file) and a PostgreSQL server through node-postgres (pg.ts, chosen by DATABASE_URL in index.ts).
// Kept free of Next.js so that tests, scripts and the server share it.
import { mkdirSync } from "node:fs";
import { dirname, join } from "node:path";
import { PGlite } from "@electric-sql/pglite";
import type { PgDatabase, PgQueryResultHKT } from "drizzle-orm/pg-core";
import { drizzle, type PgliteDatabase } from "drizzle-orm/pglite";
import { migrate } from "drizzle-orm/pglite/migrator";
import * as schema from "./schema";

/**
 * The raw client under a Db, as much of it as the code outside db/ may use: PGlite has these
 * three methods; the PostgreSQL server's pool (pg.ts) adds `exec` and `close` to pg's Pool.
 */
export interface SqlClient {
  query<T = Record<string, unknown>>(text: string, params?: unknown[]): Promise<{ rows: T[] }>;
  /** Run one or more statements without parameters. */
  exec(text: string): Promise<unknown>;
  close(): Promise<void>;
  /**
   * Several processes on one database (PostgreSQL server only): try to take, or confirm that
   * this process still holds, the session-level advisory lock `key` on a connection of its own.
   * Absent on PGlite, whose one process always holds it. `onNudge` runs in the holder when
   * another process calls `nudgeLease(key)`.
   */
  holdLease?(key: number, onNudge?: () => void): Promise<boolean>;
  nudgeLease?(key: number): Promise<void>;
}

/** Either driver's database: the queries use only what both have in common (pg-core). */
export type Db = PgDatabase<PgQueryResultHKT, typeof schema> & { $client: SqlClient };

/** A PGlite database (dumps, data directories: backups and the tests' templates). */
export type PgliteDb = PgliteDatabase<typeof schema> & { $client: PGlite };

export const MIGRATIONS_DIR = join(process.cwd(), "db", "migrations");

/** Open (or create) a PGlite database: a data directory path, or undefined for memory. */
export async function openDb(dataDir?: string, loadDataDir?: Blob | File): Promise<PgliteDb> {
  if (dataDir) mkdirSync(dirname(dataDir), { recursive: true });
  const client = await PGlite.create(dataDir ? { dataDir } : { loadDataDir });
  const db = drizzle({ client, schema }) as PgliteDb;
  await migrate(db, { migrationsFolder: MIGRATIONS_DIR });
  return db;
}
