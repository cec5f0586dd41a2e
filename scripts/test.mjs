#!/usr/bin/env node
// `npm test`: the one command that checks everything on a fresh machine, in order, stopping at
// the first failure. Installs dependencies when node_modules is missing or older than the lock
// file, then: type-check (app, tests and bench; then the service worker), lint and format, import
// direction and cycles, unit + integration tests, the integration suite again on a PostgreSQL
// server (when RIMELOG_TEST_PG_URL names one; skipped with a clear line otherwise, never in CI),
// production build, browser tests.
// Ends with the line "N passed, N failed" (tests counted from both vitest runs; a stage that fails
// without running tests counts as one failure) and a non-zero exit code on any failure.
// Plain Node ESM with built-ins only: it must run before `npm ci`.
import { accessSync, constants, existsSync, mkdirSync, readFileSync, rmSync, statSync } from "node:fs";
import { connect } from "node:net";
import { join } from "node:path";
import { ROOT, run } from "./lib.mjs";

process.chdir(ROOT);

const E2E_DIST_DIR = ".next-e2e";
const RESULTS_DIR = join(ROOT, "test-results");
const bin = (name) => join(ROOT, "node_modules", ".bin", name);
const npm = process.platform === "win32" ? "npm.cmd" : "npm";

const timings = [];
const totals = { passed: 0, failed: 0, skipped: 0 };

function banner(text) {
  const line = "=".repeat(Math.max(60, text.length + 4));
  console.log(`\n${line}\n  ${text}\n${line}`);
}

function seconds(ms) {
  return `${(ms / 1000).toFixed(1)} s`;
}

function finish(failedStage) {
  console.log("\nStage timings:");
  for (const { name, ms, ok } of timings) {
    console.log(`  ${ok ? "ok  " : "FAIL"}  ${name.padEnd(56)} ${seconds(ms).padStart(9)}`);
  }
  if (failedStage) {
    banner(`FAILED at stage: ${failedStage} — later stages were not run`);
  } else {
    banner("All stages passed");
  }
  const skipped = totals.skipped > 0 ? `, ${totals.skipped} skipped` : "";
  console.log(`${totals.passed} passed, ${totals.failed} failed${skipped}`);
  process.exit(failedStage || totals.failed > 0 ? 1 : 0);
}

/** Runs one stage; on failure prints the summary and exits. `report` is a vitest JSON file. */
async function stage(name, cmd, args, { env, report } = {}) {
  banner(`▶ ${name}`);
  if (report) rmSync(report, { force: true });
  const started = Date.now();
  const code = await run(cmd, args, env);
  const ms = Date.now() - started;
  let countedFailures = 0;
  if (report) {
    const counts = readVitestReport(report);
    if (counts) {
      totals.passed += counts.passed;
      totals.failed += counts.failed;
      totals.skipped += counts.skipped;
      countedFailures = counts.failed;
      console.log(`${name}: ${counts.passed} passed, ${counts.failed} failed of ${counts.total}`);
    }
  }
  const ok = code === 0;
  timings.push({ name, ms, ok });
  console.log(`${ok ? "✔" : "✘"} ${name} ${ok ? "passed" : `failed (exit ${code})`} in ${seconds(ms)}`);
  if (!ok) {
    // A failed type-check, build, or a vitest run that died in setup has no failed test to count;
    // count the stage itself so the closing line never reads "0 failed" on a red run.
    if (countedFailures === 0) totals.failed += 1;
    finish(name);
  }
}

function readVitestReport(file) {
  try {
    const json = JSON.parse(readFileSync(file, "utf8"));
    return {
      total: json.numTotalTests ?? 0,
      passed: json.numPassedTests ?? 0,
      failed: json.numFailedTests ?? 0,
      skipped: (json.numPendingTests ?? 0) + (json.numTodoTests ?? 0),
    };
  } catch (error) {
    console.error(`(no vitest report at ${file}: ${error.message})`);
    return null;
  }
}

function chromiumCheck() {
  const path = process.env.CHROMIUM_PATH || "/usr/bin/chromium";
  try {
    accessSync(path, constants.X_OK);
    return null;
  } catch {
    return `Chromium not found at ${path} — install it with: apt-get update && apt-get install -y chromium`;
  }
}

function dependenciesStale() {
  // npm writes node_modules/.package-lock.json on every install; compare it with the lock file.
  const marker = join(ROOT, "node_modules", ".package-lock.json");
  if (!existsSync(marker)) return "node_modules is missing";
  if (statSync(marker).mtimeMs + 1000 < statSync(join(ROOT, "package-lock.json")).mtimeMs) {
    return "node_modules is older than package-lock.json";
  }
  return null;
}

/** Why the PostgreSQL server at `url` cannot be reached (a TCP connect), or null when it can. */
function unreachable(url) {
  let host;
  let port;
  try {
    const u = new URL(url);
    host = decodeURIComponent(u.hostname) || "localhost";
    port = Number(u.port) || 5432;
  } catch {
    return Promise.resolve(`RIMELOG_TEST_PG_URL is not a URL: ${url}`);
  }
  return new Promise((done) => {
    const socket = connect({ host, port });
    const end = (why) => {
      socket.destroy();
      done(why);
    };
    socket.setTimeout(3000, () => end(`nothing answered at ${host}:${port} within 3 s`));
    socket.once("connect", () => end(null));
    socket.once("error", (e) => end(`${host}:${port}: ${e.message}`));
  });
}

const started = Date.now();

// Fail before minutes of work if the browser tests cannot run at the end.
const missingChromium = chromiumCheck();
if (missingChromium) {
  banner("✘ browser check");
  console.log(missingChromium);
  timings.push({ name: "browser check", ms: 0, ok: false });
  totals.failed += 1;
  finish("browser check");
}

const stale = dependenciesStale();
if (stale) {
  console.log(`${stale}: installing dependencies`);
  await stage("npm ci", npm, ["ci", "--no-audit", "--no-fund"]);
}

mkdirSync(RESULTS_DIR, { recursive: true });
const vitestReporters = (file) => ["--reporter=default", "--reporter=json", `--outputFile.json=${file}`];

// The app, tests and bench/ in one program; the service worker in its own (webworker types, no DOM).
await stage("type-check (tsc --noEmit)", bin("tsc"), ["--noEmit"]);
await stage("type-check the service worker (tsc -p sw/tsconfig.json --noEmit)", bin("tsc"), [
  "-p",
  "sw/tsconfig.json",
  "--noEmit",
]);
await stage("lint + format (biome check)", bin("biome"), ["check", "."]);
await stage("import direction and cycles (dependency-cruiser)", npm, ["run", "--silent", "layers"]);
const unitReport = join(RESULTS_DIR, "unit.json");
await stage("unit + integration tests (vitest)", bin("vitest"), ["run", ...vitestReporters(unitReport)], {
  report: unitReport,
});
// The integration suite and the sync property test a second time, on a PostgreSQL server
// (tests/integration/fixture.ts makes a database per test on it: use a throw-away server).
const pgUrl = process.env.RIMELOG_TEST_PG_URL;
const noServer = pgUrl ? await unreachable(pgUrl) : "RIMELOG_TEST_PG_URL is not set";
if (noServer) {
  const name = "integration tests on PostgreSQL";
  banner(`${process.env.CI ? "✘" : "○"} ${name}`);
  console.log(`skipped: no PostgreSQL server (${noServer})`);
  console.log(
    "  To run them: start a throw-away PostgreSQL server and set RIMELOG_TEST_PG_URL=postgres://user@127.0.0.1:port/postgres (README, Tests on PostgreSQL).",
  );
  if (process.env.CI) {
    // CI starts its own server (.ci/run): a missing one there is a failure, not a skip.
    timings.push({ name, ms: 0, ok: false });
    totals.failed += 1;
    finish(name);
  }
  timings.push({ name: `${name}: skipped, no server`, ms: 0, ok: true });
} else {
  const pgReport = join(RESULTS_DIR, "postgres.json");
  await stage(
    "integration + sync property tests on PostgreSQL (vitest)",
    bin("vitest"),
    ["run", ...vitestReporters(pgReport)],
    {
      // The property test's first property takes a third of its 300 runs here (each run is a few
      // hundred round trips to the server); the restart property keeps its own count.
      env: { RIMELOG_TEST_DB: "postgres", SYNC_PROPERTY_RUNS: process.env.SYNC_PROPERTY_RUNS || "100" },
      report: pgReport,
    },
  );
}
await stage(`production build (next build --webpack → ${E2E_DIST_DIR})`, bin("next"), ["build", "--webpack"], {
  env: { NEXT_DIST_DIR: E2E_DIST_DIR, NEXT_TELEMETRY_DISABLED: "1" },
});
const e2eReport = join(RESULTS_DIR, "e2e.json");
await stage(
  "browser tests (vitest e2e, Chromium)",
  bin("vitest"),
  ["run", "--config", "vitest.e2e.config.ts", ...vitestReporters(e2eReport)],
  { env: { E2E_SKIP_BUILD: "1" }, report: e2eReport },
);

console.log(`\nTotal time ${seconds(Date.now() - started)}`);
finish(null);
