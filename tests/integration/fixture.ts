// Shared test fixture: a fresh migrated (and optionally seeded) database for each test, on either
// driver. By default an in-memory PGlite: one migrated database per test worker, dumped once and
// loaded for each test (dumpDataDir/loadDataDir is much faster than initdb). With
// RIMELOG_TEST_DB=postgres, a PostgreSQL server at RIMELOG_TEST_PG_URL (a throw-away server: the
// tests create and drop databases on it): one template database per kind and worker, and a new
// database made from it for each test (CREATE DATABASE … TEMPLATE), dropped after the file.
import { afterAll } from "vitest";
import { type Db, openDb } from "@/db/client";
import type { ServerPool } from "@/db/pg";
import { seedIfEmpty } from "@/db/seed";
import { type TestDirs, testDirs } from "../support/dirs";

export const DEMO_NOW = Date.parse("2026-11-30T12:00:00Z");

/** The PostgreSQL server the tests run on, or undefined for PGlite. */
export const SERVER_URL = serverUrl();
/** True when this run is on a PostgreSQL server. */
export const ON_SERVER = SERVER_URL !== undefined;

function serverUrl(): string | undefined {
  if (process.env.RIMELOG_TEST_DB !== "postgres") return undefined;
  const url = process.env.RIMELOG_TEST_PG_URL;
  if (!url) throw new Error("RIMELOG_TEST_DB=postgres needs RIMELOG_TEST_PG_URL=postgres://user@host:port/db");
  return url;
}

// ---- PGlite -------------------------------------------------------------------------------------

let emptyDump: Promise<File | Blob> | undefined;
let seededDump: Promise<File | Blob> | undefined;

async function dumpOf(seed: boolean): Promise<File | Blob> {
  const db = await openDb();
  if (seed) await seedIfEmpty(db, DEMO_NOW);
  const dump = await db.$client.dumpDataDir("none");
  await db.$client.close();
  return dump;
}

/** The worker's one dump of each kind, made on first use. */
function dumpFor(seeded: boolean): Promise<File | Blob> {
  if (seeded) {
    seededDump ??= dumpOf(true);
    return seededDump;
  }
  emptyDump ??= dumpOf(false);
  return emptyDump;
}

// ---- PostgreSQL server --------------------------------------------------------------------------

const prefix = `rimelog_t${process.pid}_${Math.random().toString(36).slice(2, 8)}`;
let counter = 0;
const made: string[] = [];
const opened: Db[] = [];
let admin: Promise<ServerPool> | undefined;
const templates = new Map<boolean, Promise<string>>();

/** The URL of database `name` on the test server. */
export function databaseUrl(name: string): string {
  const url = new URL(SERVER_URL as string);
  url.pathname = `/${name}`;
  return url.toString();
}

function adminPool(): Promise<ServerPool> {
  admin ??= import("@/db/pg").then(
    ({ ServerPool }) => new ServerPool({ connectionString: SERVER_URL, max: 2, allowExitOnIdle: true }),
  );
  return admin;
}

async function createDatabase(template?: string): Promise<string> {
  const name = `${prefix}_${counter++}`;
  const pool = await adminPool();
  await pool.query(`create database ${name}${template ? ` template ${template} strategy file_copy` : ""}`);
  made.push(name);
  return name;
}

/** Open a server database as an app process would (migrations applied); closed after the file. */
export async function openServer(name: string, options: { max?: number } = {}): Promise<Db> {
  const { openServerDb } = await import("@/db/pg");
  const db = await openServerDb(databaseUrl(name), options);
  opened.push(db);
  return db;
}

async function makeTemplate(seeded: boolean): Promise<string> {
  const name = await createDatabase();
  const db = await openServer(name, { max: 2 });
  if (seeded) await seedIfEmpty(db, DEMO_NOW);
  // A template must have no connections while it is copied.
  await db.$client.close();
  return name;
}

/** A new database on the test server, copied from the worker's migrated (and seeded) template. */
export async function serverDatabase({ seeded = false } = {}): Promise<string> {
  let template = templates.get(seeded);
  if (!template) {
    template = makeTemplate(seeded);
    templates.set(seeded, template);
  }
  return createDatabase(await template);
}

if (ON_SERVER) {
  afterAll(async () => {
    for (const db of opened) await db.$client.close().catch(() => undefined);
    const pool = await adminPool();
    for (const name of made.reverse()) await pool.query(`drop database if exists ${name} with (force)`);
    await pool.close();
  });
}

// ---- either ---------------------------------------------------------------------------------------

/** A fresh migrated database; `seeded` adds the demo lab (fixed clock: 2026-11-30 12:00 UTC). */
export async function freshDb({ seeded = false } = {}): Promise<Db> {
  if (ON_SERVER) return openServer(await serverDatabase({ seeded }));
  return openDb(undefined, await dumpFor(seeded));
}

/**
 * An empty migrated database that outlives its connection, for restart tests: `open()` connects
 * again (PGlite on a data directory; a database on the test server), `remove()` deletes it.
 */
export async function durableDb(): Promise<{ open(): Promise<Db>; remove(): void }> {
  if (ON_SERVER) {
    const name = await serverDatabase();
    return { open: () => openServer(name), remove: () => undefined }; // dropped after the file
  }
  const dirs: TestDirs = testDirs("rimelog-durable-");
  return { open: () => openDb(dirs.dataDir), remove: () => dirs.remove() };
}
