// Throwaway directories for everything a server or a test writes to disk: the database
// (RIMELOG_DATA_DIR), uploaded files (RIMELOG_STORAGE_DIR) and the chain-signing key
// (RIMELOG_KEY_DIR). Their defaults (lib/env.ts) are the demo's ./.data/*, so a test server or a
// test that leaves one of them unset writes into the demo's data: `assertIsolatedEnv` refuses that.
import { mkdirSync, mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { isAbsolute, join, relative, resolve } from "node:path";
import { fileURLToPath } from "node:url";

/** The repository root (tests/support/ is two levels down). */
export const ROOT = fileURLToPath(new URL("../../", import.meta.url));

/** The settings that name a directory, each of which must point at a test's own. */
export const DIR_VARS = ["RIMELOG_DATA_DIR", "RIMELOG_STORAGE_DIR", "RIMELOG_KEY_DIR"] as const;
export type DirVar = (typeof DIR_VARS)[number];

export interface TestDirs {
  /** The one temp directory the three live in (and a server's log, for a test server). */
  root: string;
  dataDir: string;
  storageDir: string;
  keyDir: string;
  /** The three as environment variables. */
  env: Record<DirVar, string>;
  /** Deletes the lot. */
  remove(): void;
}

/**
 * A new temp directory with a data, a storage and a key directory in it. The storage and key
 * directories exist (mode 0700, as the server makes its key directory); the data directory does
 * not yet (PGlite and the data-dir lock create it).
 */
export function testDirs(prefix = "rimelog-test-"): TestDirs {
  const root = mkdtempSync(join(tmpdir(), prefix));
  const dataDir = join(root, "db");
  const storageDir = join(root, "files");
  const keyDir = join(root, "keys");
  mkdirSync(storageDir, { mode: 0o700 });
  mkdirSync(keyDir, { mode: 0o700 });
  return {
    root,
    dataDir,
    storageDir,
    keyDir,
    env: { RIMELOG_DATA_DIR: dataDir, RIMELOG_STORAGE_DIR: storageDir, RIMELOG_KEY_DIR: keyDir },
    remove: () => rmSync(root, { recursive: true, force: true }),
  };
}

const inside = (dir: string, parent: string) => {
  const rel = relative(parent, dir);
  return rel === "" || (!rel.startsWith("..") && !isAbsolute(rel));
};

/**
 * What is wrong with `env` as a test server's (or a test process's) environment: each of the
 * three directories must be set, and none may lie in the repository (its ./.data is the demo's).
 * Relative paths count from `cwd`, as the server resolves them. Empty when all is well.
 */
export function isolationProblems(env: Record<string, string | undefined>, cwd = ROOT): string[] {
  const problems: string[] = [];
  for (const name of DIR_VARS) {
    const value = env[name];
    if (!value) problems.push(`${name} is not set (it would default to the demo's ./.data)`);
    else if (inside(resolve(cwd, value), ROOT)) problems.push(`${name}=${value} is inside the repository`);
  }
  return problems;
}

/** Throws unless `env` gives its own directory for data, storage and keys (see isolationProblems). */
export function assertIsolatedEnv(env: Record<string, string | undefined>, what = "a test server", cwd = ROOT): void {
  const problems = isolationProblems(env, cwd);
  if (problems.length > 0) throw new Error(`${what} is not isolated from the demo's data: ${problems.join("; ")}`);
}
