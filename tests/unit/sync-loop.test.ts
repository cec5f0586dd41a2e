// The sync loop's timing: a round asked for while one runs follows it, at once when the network
// came back (a kick), after the debounce when it was a local write.
import { describe, expect, it } from "vitest";
import { SyncLoop } from "@/lib/sync/loop";
import type { Transport } from "@/lib/sync/transport";
import { nothingNew, signedInTablet } from "../support/tablet";
import { tomasz } from "../support/users";

/** A transport whose pulls are counted (one a round here: nothing is queued) and may be held. */
function countingTransport() {
  let release: () => void = () => undefined;
  const state = { pulls: 0, hold: true };
  const transport: Transport = {
    push: async () => ({ accepted: [], rejected: [] }),
    async pull(since) {
      state.pulls += 1;
      if (state.hold) await new Promise<void>((r) => (release = r));
      return nothingNew(tomasz)(since, null);
    },
  };
  return { transport, state, release: () => release() };
}

const until = async (cond: () => boolean, ms: number) => {
  for (const t0 = Date.now(); Date.now() - t0 < ms; ) {
    if (cond()) return true;
    await new Promise((r) => setTimeout(r, 10));
  }
  return cond();
};

async function loopWithRoundRunning(debounceMs: number) {
  const db = await signedInTablet(tomasz);
  const t = countingTransport();
  const loop = new SyncLoop(db, t.transport, { debounceMs, intervalMs: 60_000 });
  loop.request(0);
  expect(await until(() => t.state.pulls === 1, 2_000)).toBe(true); // the first round is held in its pull
  return { loop, ...t };
}

describe("sync loop", () => {
  it("runs the next round at once when the network returns during a round", async () => {
    const { loop, state, release } = await loopWithRoundRunning(5_000);
    loop.request(0); // `online` while the round runs
    state.hold = false;
    release();
    // Well before the 5 s debounce.
    expect(await until(() => state.pulls === 2, 1_500)).toBe(true);
    loop.stop();
  });

  it("waits the debounce after a round when a local write came during it", async () => {
    const { loop, state, release } = await loopWithRoundRunning(1_000);
    loop.request(1_000); // a write while the round runs
    state.hold = false;
    release();
    expect(await until(() => state.pulls === 2, 400)).toBe(false);
    expect(await until(() => state.pulls === 2, 2_000)).toBe(true);
    loop.stop();
  });
});
