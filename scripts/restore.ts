// Restore a backup made by `npm run db:backup` into an EMPTY data directory:
// `npm run db:restore -- backup.tar.gz`. Refuses to overwrite an existing database.
import { execFileSync } from "node:child_process";
import { existsSync, mkdirSync, readdirSync } from "node:fs";
import { resolve } from "node:path";
import { openDb } from "../db/client";
import { lockDataDir } from "../db/lock";
import { env } from "../lib/env";

const file = process.argv[2];
if (!file) {
  console.error("Name the backup file: npm run db:restore -- rimelog-backup.tar.gz");
  process.exit(2);
}
const dir = resolve(env().RIMELOG_DATA_DIR);
if (existsSync(dir) && readdirSync(dir).length > 0) {
  console.error(`${dir} already holds a database. Move it aside first; nothing was changed.`);
  process.exit(2);
}
const release = lockDataDir(dir);
try {
  // The backup is a tar of the data directory's contents (PGlite's dumpDataDir format).
  mkdirSync(dir, { recursive: true });
  execFileSync("tar", ["-xzf", resolve(file), "-C", dir], { stdio: ["ignore", "ignore", "pipe"] });
  const db = await openDb(dir);
  const r = await db.$client.query<{ n: number }>("select count(*)::int as n from entries");
  console.log(`Restored ${r.rows[0]?.n ?? 0} entries into ${dir}.`);
  await db.$client.close();
} catch (e) {
  console.error((e as Error).message);
  process.exitCode = 1;
} finally {
  release();
}
