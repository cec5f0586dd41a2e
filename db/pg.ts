// A PostgreSQL server through node-postgres (`pg`) and Drizzle: the same schema, migrations and
// queries as PGlite (client.ts). Loaded by index.ts only when DATABASE_URL is set, so the embedded
// default never loads `pg`. Several app processes may share the database: the migrations run under
// an advisory lock, appends serialise on one (db/queries/entries.ts), and the background tick runs
// in the one process that holds the tick lease (holdLease).
import { drizzle } from "drizzle-orm/node-postgres";
import { migrate } from "drizzle-orm/node-postgres/migrator";
import pg from "pg";
import { type Db, MIGRATIONS_DIR, type SqlClient } from "./client";
import { LOCK_SPACE, LOCKS } from "./locks";
import * as schema from "./schema";

const leaseChannel = (key: number) => `rimelog_lease_${key}`;

/** pg's Pool with the methods the app's code expects of any client (client.ts, SqlClient). */
export class ServerPool extends pg.Pool implements SqlClient {
  private leases = new Map<number, pg.PoolClient>();
  private pending = new Map<number, Promise<boolean>>();
  private nudged = new Map<number, () => void>();

  async nudgeLease(key: number): Promise<void> {
    await this.query("select pg_notify($1, '')", [leaseChannel(key)]);
  }

  exec(text: string): Promise<unknown> {
    return this.query(text);
  }

  async close(): Promise<void> {
    for (const [key, c] of this.leases) {
      // Unlock before leaving, so the next process can take the lease at once (a closed
      // connection frees it too, but only once the server has seen the connection end).
      await c.query("select pg_advisory_unlock($1, $2)", [LOCK_SPACE, key]).catch(() => undefined);
      c.release(true);
    }
    this.leases.clear();
    if (!this.ended) await this.end();
  }

  holdLease(key: number, onNudge?: () => void): Promise<boolean> {
    if (onNudge) this.nudged.set(key, onNudge);
    let p = this.pending.get(key);
    if (!p) {
      p = this.tryLease(key).finally(() => this.pending.delete(key));
      this.pending.set(key, p);
    }
    return p;
  }

  /** A session-level lock lives as long as its connection: keep that connection out of the pool. */
  private async tryLease(key: number): Promise<boolean> {
    const held = this.leases.get(key);
    if (held) {
      try {
        await held.query("select 1");
        return true;
      } catch {
        // The connection is gone, and the server released the lock with it: try afresh.
        this.drop(key, held);
      }
    }
    const c = await this.connect();
    try {
      const r = await c.query<{ ok: boolean }>("select pg_try_advisory_lock($1, $2) as ok", [LOCK_SPACE, key]);
      if (!r.rows[0]?.ok) {
        c.release();
        return false;
      }
    } catch (e) {
      c.release(true);
      throw e;
    }
    c.on("error", () => this.drop(key, c));
    // The holder listens on the lease's channel: another process that wants a round sooner nudges it.
    c.on("notification", (n) => {
      if (n.channel === leaseChannel(key)) this.nudged.get(key)?.();
    });
    try {
      await c.query(`listen ${leaseChannel(key)}`);
    } catch (e) {
      c.release(true); // closing the connection frees the lock
      throw e;
    }
    this.leases.set(key, c);
    return true;
  }

  private drop(key: number, c: pg.PoolClient) {
    if (this.leases.get(key) !== c) return;
    this.leases.delete(key);
    c.release(true);
  }
}

export interface ServerDbOptions {
  /** Connections in this process's pool (pg's default: 10). */
  max?: number;
  /** Run after the migrations while still holding the migration lock (the demo seed). */
  whileLocked?: (db: Db) => Promise<unknown>;
}

/** Connect to a PostgreSQL server (a postgres:// URL) and apply the committed migrations. */
export async function openServerDb(url: string, { max, whileLocked }: ServerDbOptions = {}): Promise<Db> {
  // allowExitOnIdle: idle connections do not keep a script or a test worker alive.
  const pool = new ServerPool({ connectionString: url, max, allowExitOnIdle: true });
  // An idle connection that the server drops must not take the process down; the pool replaces it.
  pool.on("error", (e) => console.error("[rimelog] PostgreSQL connection lost", e.message));
  const server = drizzle({ client: pool, schema });
  const db: Db = server;
  try {
    const lock = await pool.connect();
    try {
      await lock.query("select pg_advisory_lock($1, $2)", [LOCK_SPACE, LOCKS.migrate]);
      await migrate(server, { migrationsFolder: MIGRATIONS_DIR });
      if (whileLocked) await whileLocked(db);
    } finally {
      await lock.query("select pg_advisory_unlock($1, $2)", [LOCK_SPACE, LOCKS.migrate]).catch(() => undefined);
      lock.release();
    }
  } catch (e) {
    await pool.close();
    throw e;
  }
  return db;
}
