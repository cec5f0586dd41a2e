// The server's periodic work for the audit side: sign chain heads that moved (signed checkpoints)
// and run the mail checks and delivery. Started lazily by the audit queue, mail and sync routes and
// nudged after a push or a finding (`kickServerTick`); each step is idempotent, so an extra run
// costs nothing. With several app processes on one PostgreSQL server, only the process holding the
// tick lease (db/lease.ts: an advisory lock on a connection of its own) runs it; a kick in another
// process nudges the holder instead. A holder that stops frees the lease with its connection, and
// the next process whose round comes takes it over. On PGlite the one process always runs it.
import "server-only";
import { type Db, getDb } from "@/db";
import { holdsLease, nudgeLease } from "@/db/lease";
import { CHECKPOINT_INTERVAL_MS, signChainHeads } from "@/db/queries/chain";
import { mailTick } from "@/db/queries/mail";
import { checkpointKeys } from "@/server/audit/keys";
import { mailTransport } from "@/server/mail/transport";

type TickState = {
  timer?: ReturnType<typeof setInterval>;
  running?: Promise<void>;
  soon?: ReturnType<typeof setTimeout>;
};
const g = globalThis as unknown as { __rimelogTick?: TickState };
g.__rimelogTick ??= {};
const state: TickState = g.__rimelogTick;

/**
 * One round on `db`, if this process holds the tick lease: true when it ran. `nudge`: when it does
 * not hold the lease, ask the holder for a round soon (a kick after a push or a finding).
 */
export async function tickRound(db: Db, { nudge = false }: { nudge?: boolean } = {}): Promise<boolean> {
  if (!(await holdsLease(db, "tick", () => kickServerTick()))) {
    if (nudge) await nudgeLease(db, "tick");
    return false;
  }
  await signChainHeads(db, { keys: checkpointKeys(), minAgeMs: CHECKPOINT_INTERVAL_MS });
  await mailTick(db, mailTransport());
  return true;
}

export async function runServerTick({ nudge = false }: { nudge?: boolean } = {}): Promise<void> {
  if (state.running) return state.running;
  state.running = (async () => {
    try {
      await tickRound(await getDb(), { nudge });
    } catch (e) {
      console.error("[rimelog] server tick failed", e);
    } finally {
      state.running = undefined;
    }
  })();
  return state.running;
}

/** Start the interval once per process. */
export function ensureServerTick(intervalMs = 5 * 60_000): void {
  if (state.timer) return;
  state.timer = setInterval(() => void runServerTick(), intervalMs);
  state.timer.unref?.();
  kickServerTick();
}

/**
 * Run a tick shortly after the last nudge (trailing debounce), e.g. after a push that may hold a
 * quench or a finding: a tablet sending a long backlog is not slowed by ticks between its batches.
 */
export function kickServerTick(delayMs = 2_000): void {
  if (state.soon) clearTimeout(state.soon);
  state.soon = setTimeout(() => {
    state.soon = undefined;
    void runServerTick({ nudge: true });
  }, delayMs);
  state.soon.unref?.();
}
