// When the tablet syncs: on start, on `online`, when the page is shown again, shortly after each
// local write (debounced), and on a timer while online; after a failure it waits with
// exponential back-off (with jitter). One round at a time per tab, and across tabs through the
// Web Locks API where it exists. Nothing here holds data: the outbox in Dexie is the truth, so a
// reload in the middle of a push simply pushes again (the server answers the same).
import type { RimelogDexie } from "@/lib/local/db";
import { onLocalWrite } from "@/lib/local/events";
import { type SyncResult, syncOnce } from "./client";
import { PUSH_LIMITS } from "./protocol";
import { type Transport, TransportError } from "./transport";

export type LoopState = { running: boolean; online: boolean; nextRetryAt: number | null };
type Options = { debounceMs?: number; intervalMs?: number; minBackoffMs?: number; maxBackoffMs?: number };

export class SyncLoop {
  private timer: ReturnType<typeof setTimeout> | null = null;
  private running = false;
  /** A round was asked for while one ran: the soonest delay asked for, else null. */
  private again: number | null = null;
  private failures = 0;
  private nextRetryAt: number | null = null;
  private stopFns: (() => void)[] = [];
  private listeners = new Set<(s: LoopState) => void>();
  private readonly o: Required<Options>;

  constructor(
    private readonly db: RimelogDexie,
    private readonly transport: Transport,
    options: Options = {},
  ) {
    this.o = { debounceMs: 800, intervalMs: 60_000, minBackoffMs: 2_000, maxBackoffMs: 5 * 60_000, ...options };
  }

  start(): void {
    const kick = () => this.request(0);
    const onShow = () => document.visibilityState === "visible" && kick();
    window.addEventListener("online", kick);
    window.addEventListener("pageshow", kick);
    document.addEventListener("visibilitychange", onShow);
    const offWrite = onLocalWrite(() => this.request(this.o.debounceMs));
    const offline = () => this.emit();
    window.addEventListener("offline", offline);
    this.stopFns.push(
      () => window.removeEventListener("online", kick),
      () => window.removeEventListener("pageshow", kick),
      () => window.removeEventListener("offline", offline),
      () => document.removeEventListener("visibilitychange", onShow),
      offWrite,
    );
    kick();
  }

  stop(): void {
    for (const f of this.stopFns) f();
    this.stopFns = [];
    if (this.timer) clearTimeout(this.timer);
    this.timer = null;
  }

  subscribe(fn: (s: LoopState) => void): () => void {
    this.listeners.add(fn);
    fn(this.state());
    return () => this.listeners.delete(fn);
  }

  state(): LoopState {
    return {
      running: this.running,
      online: typeof navigator === "undefined" ? true : navigator.onLine,
      nextRetryAt: this.nextRetryAt,
    };
  }

  /** Ask for a round in `delayMs` (sooner requests win). */
  request(delayMs = 0): void {
    if (this.running) {
      // Kept for when the round ends: the network coming back mid-round is followed at once,
      // a write mid-round after the debounce.
      this.again = Math.min(this.again ?? delayMs, delayMs);
      return;
    }
    if (this.timer) clearTimeout(this.timer);
    this.timer = setTimeout(() => void this.run(), delayMs);
  }

  /** Run one round now and report its outcome (used by sign-out). */
  async run(): Promise<SyncResult | TransportError | Error> {
    if (this.running) {
      // This caller's own round follows the one running.
      await new Promise<void>((r) => {
        const off = this.subscribe((s) => {
          if (!s.running) {
            off();
            r();
          }
        });
      });
    }
    this.running = true;
    this.again = null;
    this.nextRetryAt = null;
    this.emit();
    let outcome: SyncResult | TransportError | Error;
    try {
      outcome = await withLock(() =>
        syncOnce(this.db, this.transport, { maxBatch: PUSH_LIMITS.maxEntries, maxBytes: PUSH_LIMITS.maxBytes }),
      );
      this.failures = 0;
    } catch (e) {
      outcome = e instanceof Error ? e : new Error(String(e));
      this.failures += 1;
      const te = e instanceof TransportError ? e : null;
      const at = new Date().toISOString();
      await this.db.meta
        .bulkPut([
          { key: "lastError", value: { code: te?.kind ?? "error", message: outcome.message, at } },
          { key: "lastAttempt", value: at },
        ])
        .catch(() => undefined);
    } finally {
      this.running = false;
    }
    this.schedule(outcome);
    this.emit();
    return outcome;
  }

  private schedule(outcome: unknown): void {
    if (this.timer) clearTimeout(this.timer);
    if (this.again !== null) {
      const delay = this.again;
      this.again = null;
      this.timer = setTimeout(() => void this.run(), delay);
      return;
    }
    let delay = this.o.intervalMs;
    if (outcome instanceof Error) {
      // No point retrying a dead session on a timer: the sign-in brings us back.
      if (outcome instanceof TransportError && outcome.kind === "unauthorized") delay = this.o.maxBackoffMs;
      else
        delay =
          Math.min(this.o.maxBackoffMs, this.o.minBackoffMs * 2 ** Math.min(this.failures - 1, 12)) *
          (0.75 + Math.random() * 0.5);
      this.nextRetryAt = Date.now() + delay;
    }
    this.timer = setTimeout(() => {
      // Timer rounds only while online; `online` kicks a round as soon as the network returns.
      if (typeof navigator !== "undefined" && !navigator.onLine) this.schedule(outcome);
      else void this.run();
    }, delay);
  }

  private emit(): void {
    const s = this.state();
    for (const fn of this.listeners) fn(s);
  }
}

async function withLock<T>(fn: () => Promise<T>): Promise<T> {
  const locks = typeof navigator !== "undefined" ? (navigator as Navigator & { locks?: LockManager }).locks : undefined;
  if (!locks) return fn();
  return locks.request("rimelog-sync", () => fn()) as Promise<T>;
}
