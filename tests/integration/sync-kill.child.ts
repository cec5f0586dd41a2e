// Child process for sync-kill.test.ts (not a test itself): the "server" side. Opens the data dir,
// applies the pushes in the batch file one after another, and says before and after each one,
// so the parent can SIGKILL it in the middle of one.
import { readFileSync } from "node:fs";
import { openDb } from "@/db/client";
import { applyPush } from "@/server/sync/apply";

const [dir, batchFile] = process.argv.slice(2);
if (!dir || !batchFile) throw new Error("usage: sync-kill.child.ts <data dir> <batch file>");
const { user, pushes } = JSON.parse(readFileSync(batchFile, "utf8")) as {
  user: Parameters<typeof applyPush>[1];
  pushes: unknown[];
};
const db = await openDb(dir);
process.stdout.write("open\n");
for (const [i, body] of pushes.entries()) {
  process.stdout.write(`applying ${i}\n`);
  await applyPush(db, user, body);
  process.stdout.write(`applied ${i}\n`);
}
await db.$client.close();
process.stdout.write("done\n");
