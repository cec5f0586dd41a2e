// Helpers shared by the npm scripts in this folder (demo.mjs, test.mjs).
// Plain Node ESM with built-ins only: the scripts run before `npm ci`.
import { spawn } from "node:child_process";
import { dirname, join } from "node:path";
import { fileURLToPath } from "node:url";

/** The repository root (this file sits in scripts/). */
export const ROOT = join(dirname(fileURLToPath(import.meta.url)), "..");

/** Runs a command in ROOT with the terminal attached; resolves to its exit code (127 when it cannot start). */
export function run(cmd, argv, env = {}) {
  return new Promise((done) => {
    const child = spawn(cmd, argv, { cwd: ROOT, stdio: "inherit", env: { ...process.env, ...env } });
    child.on("error", (error) => {
      console.error(`could not start ${cmd}: ${error.message}`);
      done(127);
    });
    child.on("exit", (code, signal) => done(code ?? (signal ? 128 : 1)));
  });
}
