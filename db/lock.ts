// An exclusive lock on a PGlite data directory. PGlite does not refuse a second process on the
// same directory, and data is lost when two write to it, so the app refuses to start instead.
import { closeSync, mkdirSync, openSync, readFileSync, unlinkSync, writeSync } from "node:fs";
import { dirname } from "node:path";

export class DataDirLockedError extends Error {}

function alive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch (e) {
    return (e as NodeJS.ErrnoException).code === "EPERM";
  }
}

/** Take the lock or throw a DataDirLockedError naming the holder. Returns a release function. */
export function lockDataDir(dir: string): () => void {
  // The lock sits beside the directory, so the directory itself stays PGlite's alone
  // (PGlite only loads a backup into a directory that does not exist yet).
  mkdirSync(dirname(dir), { recursive: true });
  const file = `${dir}.lock`;
  for (let attempt = 0; attempt < 2; attempt++) {
    try {
      const fd = openSync(file, "wx", 0o600);
      writeSync(fd, String(process.pid));
      closeSync(fd);
      let released = false;
      return () => {
        if (released) return;
        released = true;
        try {
          unlinkSync(file);
        } catch {
          /* already gone */
        }
      };
    } catch (e) {
      if ((e as NodeJS.ErrnoException).code !== "EEXIST") throw e;
      const pid = Number.parseInt(readFileSync(file, "utf8"), 10);
      if (Number.isInteger(pid) && pid > 0 && pid !== process.pid && alive(pid)) {
        throw new DataDirLockedError(
          `The database directory ${dir} is in use by another Rimelog process (pid ${pid}). ` +
            `Only one process may open it: stop the other one, or point RIMELOG_DATA_DIR elsewhere.`,
        );
      }
      // Stale lock from a process that died: remove it and try once more.
      unlinkSync(file);
    }
  }
  throw new DataDirLockedError(`Could not take the lock on ${dir}.`);
}
