// The test harness's production server, shared by the browser tests (tests/e2e/global-setup.ts)
// and the bench (bench/sync.ts): a build in its own dist dir, one `next start` in its own
// process group on a free port, its own temp directories for data, files and keys (never the
// demo's ./.data), a log file, and a readiness wait on /api/health.
import { type ChildProcess, spawn } from "node:child_process";
import { randomBytes } from "node:crypto";
import { closeSync, existsSync, openSync, readFileSync, rmSync } from "node:fs";
import { createServer } from "node:net";
import { join } from "node:path";
import { assertIsolatedEnv, type TestDirs, testDirs } from "./dirs";

export const E2E_DIST_DIR = ".next-e2e";

export interface RunningServer {
  baseURL: string;
  port: number;
  pid: number;
  /** Its directories: `dirs.root` holds the data, files and keys directories and the log. */
  dirs: TestDirs;
  logFile: string;
  /** The environment it was started with. */
  env: NodeJS.ProcessEnv;
  child: ChildProcess;
}

/** Next's command-line script, run with this Node so that Node flags (a CPU profile) apply. */
function nextScript(root: string): string {
  const script = join(root, "node_modules", "next", "dist", "bin", "next");
  if (!existsSync(script)) {
    throw new Error(`${script} is missing — run: npm ci --no-audit --no-fund`);
  }
  return script;
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

/** Builds the app into `distDir` so a build for tests never clobbers a developer's `.next`. */
export async function buildApp(root: string, distDir = E2E_DIST_DIR): Promise<void> {
  const started = Date.now();
  console.log(`[e2e] next build --webpack → ${distDir} …`);
  const code = await new Promise<number | null>((resolve, reject) => {
    const child = spawn(process.execPath, [nextScript(root), "build", "--webpack"], {
      cwd: root,
      env: { ...process.env, NEXT_DIST_DIR: distDir },
      stdio: "inherit",
    });
    child.on("error", reject);
    child.on("exit", resolve);
  });
  if (code !== 0) throw new Error(`next build failed (exit ${code})`);
  console.log(`[e2e] build done in ${((Date.now() - started) / 1000).toFixed(1)} s`);
}

/** Throws unless `distDir` holds a build: `why` opens the message, `orElse` ends its advice. */
export function assertBuildExists(
  root: string,
  distDir = E2E_DIST_DIR,
  why = "E2E_SKIP_BUILD=1 but",
  orElse = ", or unset E2E_SKIP_BUILD",
): void {
  if (!existsSync(join(root, distDir, "BUILD_ID"))) {
    throw new Error(
      `${why} there is no build in ${distDir}/ — run ` +
        `NEXT_DIST_DIR=${distDir} node_modules/.bin/next build --webpack${orElse}`,
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

/**
 * The environment of a test server: the caller's, then the app's settings for a throwaway run
 * (its own data, storage and key directories from `dirs`, a fresh auth secret, local mail), then
 * `extra`. The three directories always come from `dirs`, whatever the caller's environment says.
 */
export function serverEnv(
  dirs: TestDirs,
  {
    baseURL,
    distDir = E2E_DIST_DIR,
    extra = {},
  }: { baseURL: string; distDir?: string; extra?: Record<string, string> },
): NodeJS.ProcessEnv {
  return {
    ...process.env,
    NODE_ENV: "production",
    AUTH_SECRET: `test-only-${randomBytes(24).toString("hex")}`,
    NEXTAUTH_URL: baseURL,
    AUTH_TRUST_HOST: "true",
    RIMELOG_MAIL: "fake",
    NEXT_DIST_DIR: distDir,
    NEXT_TELEMETRY_DISABLED: "1",
    ...extra,
    ...dirs.env,
  };
}

export interface StartOptions {
  /** The build to serve (default .next-e2e). */
  distDir?: string;
  /** Node flags for the server process (the bench's --cpu-prof). */
  nodeArgs?: string[];
  /** More environment variables for the server. */
  env?: Record<string, string>;
  /** Names the run in its temp directory's name and its log lines (default "e2e"). */
  tag?: string;
}

/** Starts `next start` on a free port with its own directories; refuses to start without them. */
export async function startServer(root: string, opts: StartOptions = {}): Promise<RunningServer> {
  const tag = opts.tag ?? "e2e";
  const dirs = testDirs(`rimelog-${tag}-`);
  const logFile = join(dirs.root, "server.log");
  const port = await freePort();
  // localhost, not 127.0.0.1: next-auth redirects to NEXTAUTH_URL and cookies are per host name.
  const baseURL = `http://localhost:${port}`;
  const env = serverEnv(dirs, { baseURL, distDir: opts.distDir, extra: opts.env });
  assertIsolatedEnv(env, `the test server on ${baseURL}`, root);
  const logFd = openSync(logFile, "a");
  const child = spawn(
    process.execPath,
    [...(opts.nodeArgs ?? []), nextScript(root), "start", "-p", String(port), "-H", "127.0.0.1"],
    {
      cwd: root,
      // Its own process group, so teardown can end next-server and anything it spawned in one go.
      detached: true,
      stdio: ["ignore", logFd, logFd],
      env,
    },
  );
  closeSync(logFd);
  if (child.pid === undefined) throw new Error("next start did not start (no pid)");
  console.log(`[${tag}] next start on ${baseURL} (pid ${child.pid}), log: ${logFile}`);
  return { baseURL, port, pid: child.pid, dirs, logFile, env, child };
}

/**
 * The environment the server process really runs with, read back from /proc (Linux); null where
 * there is no /proc. For the harness's own check that the server got its directories.
 */
export function processEnv(pid: number): Record<string, string> | null {
  try {
    const raw = readFileSync(`/proc/${pid}/environ`, "utf8");
    return Object.fromEntries(
      raw
        .split("\0")
        .filter(Boolean)
        .map((kv) => [kv.slice(0, kv.indexOf("=")), kv.slice(kv.indexOf("=") + 1)]),
    );
  } catch {
    return null;
  }
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
          console.log(`[server] ready in ${((Date.now() - started) / 1000).toFixed(1)} s`);
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
  console.warn(`[server] group ${server.pid} ignored SIGTERM for ${graceMs / 1000} s; sending SIGKILL`);
  try {
    process.kill(-server.pid, "SIGKILL");
  } catch {
    // Already gone between the check and the kill.
  }
}

/** Deletes what the server wrote (data, files, keys); its log stays beside them for a look. */
export function removeServerData(server: RunningServer): void {
  for (const dir of [server.dirs.dataDir, server.dirs.storageDir, server.dirs.keyDir]) {
    rmSync(dir, { recursive: true, force: true });
  }
}
