// Builds and runs the production app for the e2e suite: one `next start` in its own process group,
// a throwaway data directory, a log file, and a readiness wait on /api/health.
import { type ChildProcess, spawn } from "node:child_process";
import { randomBytes } from "node:crypto";
import { closeSync, existsSync, mkdtempSync, openSync, readFileSync, rmSync } from "node:fs";
import { createServer } from "node:net";
import { tmpdir } from "node:os";
import { join } from "node:path";

export const E2E_DIST_DIR = ".next-e2e";

export interface RunningServer {
  baseURL: string;
  port: number;
  pid: number;
  workDir: string;
  dataDir: string;
  logFile: string;
  child: ChildProcess;
}

function nextBin(root: string): string {
  const bin = join(root, "node_modules", ".bin", "next");
  if (!existsSync(bin)) {
    throw new Error(`${bin} is missing — run: npm ci --no-audit --no-fund`);
  }
  return bin;
}

/** Last `lines` lines of a log file, for failure messages. */
export function logTail(file: string, lines = 80): string {
  try {
    const text = readFileSync(file, "utf8");
    return text.split("\n").slice(-lines).join("\n");
  } catch (error) {
    return `(no server log at ${file}: ${(error as Error).message})`;
  }
}

/** Builds the app into E2E_DIST_DIR so a build for e2e never clobbers a developer's `.next`. */
export async function buildApp(root: string): Promise<void> {
  const started = Date.now();
  console.log(`[e2e] next build --webpack → ${E2E_DIST_DIR} …`);
  const code = await new Promise<number | null>((resolve, reject) => {
    const child = spawn(nextBin(root), ["build", "--webpack"], {
      cwd: root,
      env: { ...process.env, NEXT_DIST_DIR: E2E_DIST_DIR },
      stdio: "inherit",
    });
    child.on("error", reject);
    child.on("exit", resolve);
  });
  if (code !== 0) throw new Error(`next build failed (exit ${code})`);
  console.log(`[e2e] build done in ${((Date.now() - started) / 1000).toFixed(1)} s`);
}

export function assertBuildExists(root: string): void {
  if (!existsSync(join(root, E2E_DIST_DIR, "BUILD_ID"))) {
    throw new Error(
      `E2E_SKIP_BUILD=1 but there is no build in ${E2E_DIST_DIR}/ — run ` +
        `NEXT_DIST_DIR=${E2E_DIST_DIR} node_modules/.bin/next build --webpack, or unset E2E_SKIP_BUILD`,
    );
  }
}

/** A port the kernel just handed out on loopback; tiny race with other processes, fine for tests. */
export function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const probe = createServer();
    probe.unref();
    probe.on("error", reject);
    probe.listen(0, "127.0.0.1", () => {
      const address = probe.address();
      if (address === null || typeof address === "string") {
        probe.close();
        reject(new Error("could not read the probe port"));
        return;
      }
      const { port } = address;
      probe.close(() => resolve(port));
    });
  });
}

export async function startServer(root: string): Promise<RunningServer> {
  const workDir = mkdtempSync(join(tmpdir(), "rimelog-e2e-"));
  const dataDir = join(workDir, "data");
  const logFile = join(workDir, "server.log");
  const port = await freePort();
  // localhost, not 127.0.0.1: next-auth redirects to NEXTAUTH_URL and cookies are per host name.
  const baseURL = `http://localhost:${port}`;
  const logFd = openSync(logFile, "a");
  const child = spawn(nextBin(root), ["start", "-p", String(port), "-H", "127.0.0.1"], {
    cwd: root,
    // Its own process group, so teardown can end next-server and anything it spawned in one go.
    detached: true,
    stdio: ["ignore", logFd, logFd],
    env: {
      ...process.env,
      NODE_ENV: "production",
      RIMELOG_DATA_DIR: dataDir,
      AUTH_SECRET: `e2e-only-${randomBytes(24).toString("hex")}`,
      NEXTAUTH_URL: baseURL,
      AUTH_TRUST_HOST: "true",
      RIMELOG_MAIL: "fake",
      NEXT_DIST_DIR: E2E_DIST_DIR,
      NEXT_TELEMETRY_DISABLED: "1",
    },
  });
  closeSync(logFd);
  if (child.pid === undefined) throw new Error("next start did not start (no pid)");
  console.log(`[e2e] next start on ${baseURL} (pid ${child.pid}), log: ${logFile}`);
  return { baseURL, port, pid: child.pid, workDir, dataDir, logFile, child };
}

/** Polls /api/health until it answers 200 `{ ok: true }`; fails early if the server dies. */
export async function waitForHealth(server: RunningServer, timeoutMs = 60_000): Promise<void> {
  const started = Date.now();
  const state: { exit: string | null } = { exit: null };
  server.child.once("exit", (code, signal) => {
    state.exit = `exited with code ${code} signal ${signal}`;
  });
  let last = "no answer yet";
  while (Date.now() - started < timeoutMs) {
    if (state.exit !== null) {
      throw new Error(`next start ${state.exit} before it was ready.\n--- server log ---\n${logTail(server.logFile)}`);
    }
    try {
      const response = await fetch(`${server.baseURL}/api/health`, { signal: AbortSignal.timeout(10_000) });
      const text = await response.text();
      last = `HTTP ${response.status}: ${text.slice(0, 200)}`;
      if (response.status === 200) {
        const body = JSON.parse(text) as { ok?: unknown };
        if (body.ok === true) {
          console.log(`[e2e] server ready in ${((Date.now() - started) / 1000).toFixed(1)} s`);
          return;
        }
      }
    } catch (error) {
      last = (error as Error).message;
    }
    await new Promise((resolve) => setTimeout(resolve, 250));
  }
  throw new Error(
    `server at ${server.baseURL} was not healthy after ${timeoutMs / 1000} s (last: ${last}).\n` +
      `--- server log (${server.logFile}) ---\n${logTail(server.logFile)}`,
  );
}

function groupAlive(pid: number): boolean {
  try {
    process.kill(-pid, 0);
    return true;
  } catch {
    return false;
  }
}

/** SIGTERM to the whole group (the app closes PGlite on it), SIGKILL after a grace period. */
export async function stopServer(server: RunningServer, graceMs = 10_000): Promise<void> {
  if (!groupAlive(server.pid)) return;
  try {
    process.kill(-server.pid, "SIGTERM");
  } catch {
    return;
  }
  const deadline = Date.now() + graceMs;
  while (Date.now() < deadline) {
    if (!groupAlive(server.pid)) return;
    await new Promise((resolve) => setTimeout(resolve, 100));
  }
  console.warn(`[e2e] server group ${server.pid} ignored SIGTERM for ${graceMs / 1000} s; sending SIGKILL`);
  try {
    process.kill(-server.pid, "SIGKILL");
  } catch {
    // Already gone between the check and the kill.
  }
}

export function removeDataDir(server: RunningServer): void {
  rmSync(server.dataDir, { recursive: true, force: true });
}
