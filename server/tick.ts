// The server's periodic work for the audit side: sign chain heads that moved (signed checkpoints)
// and run the mail checks and delivery. Started lazily by the audit queue, mail and sync routes and
// nudged after a push or a finding (`kickServerTick`); each step is idempotent, so an extra run
// costs nothing.
import "server-only";
import { getDb } from "@/db";
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

export async function runServerTick(): Promise<void> {
  if (state.running) return state.running;
  state.running = (async () => {
    try {
      const db = await getDb();
      await signChainHeads(db, { keys: checkpointKeys(), minAgeMs: CHECKPOINT_INTERVAL_MS });
      await mailTick(db, mailTransport());
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
    void runServerTick();
  }, delayMs);
  state.soon.unref?.();
}
