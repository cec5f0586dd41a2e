// Vitest global setup for the browser suite: refuses to run without Chromium, builds the app
// (unless E2E_SKIP_BUILD=1), starts one production server with its own data, storage and key
// directories (tests/support/server.ts), checks that the running server really got them, hands
// its URL to the tests through `provide`, and ends the server's process group afterwards.
import { fileURLToPath } from "node:url";
import type { TestProject } from "vitest/node";
import { assertIsolatedEnv } from "../support/dirs";
import {
  assertBuildExists,
  buildApp,
  logTail,
  processEnv,
  type RunningServer,
  removeServerData,
  startServer,
  stopServer,
  waitForHealth,
} from "../support/server";
import { assertChromiumInstalled } from "./support/chromium";

declare module "vitest" {
  export interface ProvidedContext {
    baseURL: string;
    serverLog: string;
  }
}

const ROOT = fileURLToPath(new URL("../../", import.meta.url));

export default async function setup(project: TestProject): Promise<() => Promise<void>> {
  assertChromiumInstalled();

  if (process.env.E2E_SKIP_BUILD === "1") {
    assertBuildExists(ROOT);
  } else {
    await buildApp(ROOT);
  }

  let server: RunningServer | undefined;
  try {
    server = await startServer(ROOT);
    // The first request migrates and seeds the demo lab: seen taking 10–48 s on a busy 2-core
    // machine, so allow 2 minutes (E2E_HEALTH_TIMEOUT_MS overrides).
    await waitForHealth(server, Number(process.env.E2E_HEALTH_TIMEOUT_MS) || 120_000);
    // What the server process runs with (from /proc where there is one), not only what was
    // meant for it: a server without its own data, storage or key directory fails the run here.
    assertIsolatedEnv(processEnv(server.pid) ?? server.env, `the e2e server (pid ${server.pid})`, ROOT);
  } catch (error) {
    if (server) await stopServer(server);
    throw error;
  }
  project.provide("baseURL", server.baseURL);
  project.provide("serverLog", server.logFile);

  const running = server;
  return async () => {
    // The server's side of a failing browser test (a 500, a stack trace) is only in its log.
    const failed = project.vitest.state.getCountOfFailedTests();
    await stopServer(running);
    if (failed > 0 || process.env.E2E_SHOW_SERVER_LOG === "1") {
      console.log(`\n--- last lines of the server log (${running.logFile}) ---\n${logTail(running.logFile)}\n---`);
    }
    if (process.env.E2E_KEEP_DATA === "1") {
      console.log(`[e2e] kept the server's data, files and keys in ${running.dirs.root}`);
    } else {
      removeServerData(running);
    }
  };
}
