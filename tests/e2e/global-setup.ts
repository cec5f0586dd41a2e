// Vitest global setup for the browser suite: refuses to run without Chromium, builds the app
// (unless E2E_SKIP_BUILD=1), starts one production server on a fresh data dir, hands its URL to
// the tests through `provide`, and ends the server's process group afterwards.
import { fileURLToPath } from "node:url";
import type { TestProject } from "vitest/node";
import { assertChromiumInstalled } from "./support/chromium";
import {
  assertBuildExists,
  buildApp,
  logTail,
  type RunningServer,
  removeDataDir,
  startServer,
  stopServer,
  waitForHealth,
} from "./support/server";

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
      console.log(`[e2e] kept data dir ${running.dataDir}`);
    } else {
      removeDataDir(running);
    }
  };
}
