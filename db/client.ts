// Opening a PGlite database through Drizzle and applying the committed migrations.
// Kept free of Next.js so that tests, scripts and the server share it.
import { mkdirSync } from "node:fs";
import { dirname, join } from "node:path";
import { PGlite } from "@electric-sql/pglite";
import { drizzle, type PgliteDatabase } from "drizzle-orm/pglite";
import { migrate } from "drizzle-orm/pglite/migrator";
import * as schema from "./schema";

export type Db = PgliteDatabase<typeof schema> & { $client: PGlite };

export const MIGRATIONS_DIR = join(process.cwd(), "db", "migrations");

/** Open (or create) a database: a data directory path, or undefined for memory. */
export async function openDb(dataDir?: string, loadDataDir?: Blob | File): Promise<Db> {
  if (dataDir) mkdirSync(dirname(dataDir), { recursive: true });
  const client = await PGlite.create(dataDir ? { dataDir } : { loadDataDir });
  const db = drizzle({ client, schema }) as Db;
  await migrate(db, { migrationsFolder: MIGRATIONS_DIR });
  return db;
}
