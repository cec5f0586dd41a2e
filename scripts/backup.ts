// Backup of the embedded database: `npm run db:backup -- [file]`. PGlite runs without fsync, so
// a committed row survives a killed process but not necessarily a power cut: take backups.
// Stop the app first — the data directory is locked while it runs.
import { writeFileSync } from "node:fs";
import { resolve } from "node:path";
import { openDb } from "../db/client";
import { lockDataDir } from "../db/lock";
import { env } from "../lib/env";

const dir = resolve(env().RIMELOG_DATA_DIR);
const out = resolve(process.argv[2] ?? `rimelog-backup-${new Date().toISOString().replace(/[:.]/g, "-")}.tar.gz`);
const release = lockDataDir(dir);
try {
  const db = await openDb(dir);
  const dump = await db.$client.dumpDataDir("gzip");
  writeFileSync(out, Buffer.from(await dump.arrayBuffer()));
  await db.$client.close();
  console.log(`Backup of ${dir} written to ${out}. Restore with: npm run db:restore -- ${out}`);
} catch (e) {
  console.error((e as Error).message);
  process.exitCode = 1;
} finally {
  release();
}
