#!/usr/bin/env node
// `npm run demo`: installs dependencies if needed, makes a development secret when AUTH_SECRET is
// unset, builds, starts the production server on PORT (default 3000) with its database in
// .data/db, waits until it is ready and prints the address and the demo accounts.
// Plain Node ESM with built-ins only: it must run before `npm ci`.
//
//   node scripts/demo.mjs             build, then start
//   node scripts/demo.mjs --no-build  start the existing build if it is newer than the sources
import { spawn } from "node:child_process";
import { randomBytes } from "node:crypto";
import { chmodSync, existsSync, mkdirSync, readdirSync, readFileSync, statSync, writeFileSync } from "node:fs";
import { dirname, join, resolve } from "node:path";
import { ROOT, run } from "./lib.mjs";

process.chdir(ROOT);

const args = new Set(process.argv.slice(2));
const unknown = [...args].filter((arg) => arg !== "--no-build");
if (unknown.length > 0) {
  console.error(`unknown option ${unknown.join(" ")} — usage: node scripts/demo.mjs [--no-build]`);
  process.exit(2);
}

const PORT = process.env.PORT || "3000";
const DIST_DIR = process.env.NEXT_DIST_DIR || ".next";
const DATA_DIR = resolve(ROOT, process.env.RIMELOG_DATA_DIR || ".data/db");
const SECRET_FILE = join(ROOT, ".data", "auth-secret");
const npm = process.platform === "win32" ? "npm.cmd" : "npm";
const nextBin = join(ROOT, "node_modules", ".bin", "next");

const DEMO_PASSWORD = "cold-hall-demo";
const DEMO_ACCOUNTS = [
  ["ines@larchmere.example", "facility admin", "Ines Vartanian"],
  ["tomasz@larchmere.example", "technician", "Tomasz Okafor"],
  ["priya@larchmere.example", "technician", "Priya Lindqvist"],
  ["mateo@larchmere.example", "researcher", "Dr. Mateo Brandt"],
  ["yuki@larchmere.example", "researcher", "Yuki Hallström"],
  ["grace@larchmere.example", "safety officer", "Dr. Grace Oyelaran"],
];

async function mustRun(what, cmd, argv, env) {
  const code = await run(cmd, argv, env);
  if (code !== 0) {
    console.error(`\n${what} failed (exit ${code}).`);
    process.exit(code);
  }
}

/** AUTH_SECRET from the environment, else a per-checkout secret kept in .data/ (gitignored). */
function authSecret() {
  if (process.env.AUTH_SECRET) return process.env.AUTH_SECRET;
  if (existsSync(SECRET_FILE)) {
    const saved = readFileSync(SECRET_FILE, "utf8").trim();
    if (saved.length >= 32) {
      console.log("Using the development secret in .data/auth-secret — set AUTH_SECRET for real use.");
      return saved;
    }
  }
  mkdirSync(dirname(SECRET_FILE), { recursive: true, mode: 0o700 });
  const secret = randomBytes(32).toString("base64url");
  writeFileSync(SECRET_FILE, `${secret}\n`, { mode: 0o600 });
  chmodSync(SECRET_FILE, 0o600);
  console.log("development secret generated in .data/auth-secret — set AUTH_SECRET for real use");
  return secret;
}

/** Newest modification time under the paths a build depends on (files the build writes excluded). */
function newestSourceTime() {
  const generated = /^(sw\.js(\.map)?|swe-worker-.*\.js)$/;
  let newest = 0;
  const visit = (path) => {
    if (!existsSync(path)) return;
    const stat = statSync(path);
    if (stat.isDirectory()) {
      for (const entry of readdirSync(path)) visit(join(path, entry));
    } else if (!generated.test(path.split("/").pop() ?? "")) {
      newest = Math.max(newest, stat.mtimeMs);
    }
  };
  for (const entry of ["app", "components", "db", "lib", "sw", "public", "types"]) visit(join(ROOT, entry));
  for (const file of readdirSync(ROOT)) {
    if (
      /^(package(-lock)?\.json|next\.config\.\w+|proxy\.ts|middleware\.ts|tsconfig\.json|postcss\.config\.\w+|tailwind\.config\.\w+)$/.test(
        file,
      )
    ) {
      visit(join(ROOT, file));
    }
  }
  return newest;
}

function buildIsCurrent() {
  const buildId = join(ROOT, DIST_DIR, "BUILD_ID");
  return existsSync(buildId) && statSync(buildId).mtimeMs >= newestSourceTime();
}

async function waitForHealth(url, child, timeoutMs = 60_000) {
  const started = Date.now();
  while (Date.now() - started < timeoutMs) {
    if (child.exitCode !== null || child.signalCode !== null) return false;
    try {
      const response = await fetch(`${url}/api/health`, { signal: AbortSignal.timeout(10_000) });
      if (response.ok && (await response.json()).ok === true) return true;
    } catch {
      // Not listening yet, or still migrating.
    }
    await new Promise((done) => setTimeout(done, 300));
  }
  return false;
}

// 1. Dependencies.
if (!existsSync(nextBin)) {
  console.log("node_modules is missing: running npm ci (about half a minute) …");
  await mustRun("npm ci", npm, ["ci", "--no-audit", "--no-fund"]);
}

// 2. Secret.
const secret = authSecret();

// 3. Build.
if (args.has("--no-build") && buildIsCurrent()) {
  console.log(`Using the existing build in ${DIST_DIR}/ (--no-build).`);
} else {
  if (args.has("--no-build")) console.log(`No build in ${DIST_DIR}/ newer than the sources: building anyway.`);
  console.log("Building (next build --webpack, about half a minute) …");
  await mustRun("next build", nextBin, ["build", "--webpack"], {
    NEXT_DIST_DIR: DIST_DIR,
    NEXT_TELEMETRY_DISABLED: "1",
  });
}

// 4. Start, in its own process group so a signal reaches next-server and everything under it.
mkdirSync(dirname(DATA_DIR), { recursive: true });
const url = `http://localhost:${PORT}`;
const server = spawn(nextBin, ["start", "-p", PORT], {
  cwd: ROOT,
  detached: true,
  stdio: "inherit",
  env: {
    ...process.env,
    NODE_ENV: "production",
    AUTH_SECRET: secret,
    NEXTAUTH_URL: process.env.NEXTAUTH_URL || url,
    AUTH_TRUST_HOST: process.env.AUTH_TRUST_HOST || "true",
    RIMELOG_DATA_DIR: DATA_DIR,
    RIMELOG_MAIL: process.env.RIMELOG_MAIL || "fake",
    NEXT_DIST_DIR: DIST_DIR,
    NEXT_TELEMETRY_DISABLED: "1",
  },
});

let stopping = 0;
function forward(signal) {
  stopping += 1;
  try {
    // A second Ctrl-C means "now".
    process.kill(-server.pid, stopping > 1 ? "SIGKILL" : signal);
  } catch {
    process.exit(1);
  }
}
process.on("SIGINT", () => forward("SIGINT"));
process.on("SIGTERM", () => forward("SIGTERM"));
server.on("exit", (code, signal) => {
  if (stopping === 0) console.error(`\nThe server stopped (${signal ?? `exit ${code}`}).`);
  process.exit(stopping > 0 ? 0 : (code ?? 1));
});

// 5. Ready: say where and who.
if (await waitForHealth(url, server)) {
  const width = Math.max(...DEMO_ACCOUNTS.map(([email]) => email.length));
  console.log(`\nRimelog is running at ${url}  (database: ${DATA_DIR})\n`);
  console.log(`Demo accounts — password for all: ${DEMO_PASSWORD}\n`);
  console.log(`  ${"email".padEnd(width)}  ${"role".padEnd(15)}  name`);
  for (const [email, role, name] of DEMO_ACCOUNTS) {
    console.log(`  ${email.padEnd(width)}  ${role.padEnd(15)}  ${name}`);
  }
  console.log("\nPress Ctrl-C to stop.");
} else if (server.exitCode === null && server.signalCode === null) {
  console.error(`\n${url}/api/health did not answer { ok: true } within 60 s; the server's output is above.`);
  forward("SIGTERM");
}
