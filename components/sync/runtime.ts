"use client";
// The page's one sync loop (browser transport on the tablet store), started on first use, and a
// hook for its live state (a round running, online/offline, next retry).
import { useEffect, useState } from "react";
import { localSyncDb } from "@/lib/local/db";
import { httpTransport } from "@/lib/sync/http";
import { type LoopState, SyncLoop } from "@/lib/sync/loop";

let loop: SyncLoop | undefined;

/**
 * Copies of server data that earlier versions of the app kept in localStorage (the user, the
 * rules, series, calibrations, cryostat lists): the tablet store holds them now. The theme and the
 * signing PIN's verifier stay where they are.
 */
const LEGACY_COPY = /^rimelog-(me$|rules$|cryostat-list$|series-|calibrations-|cryostat-config-)/;

function dropLegacyCopies(): void {
  try {
    for (let i = localStorage.length - 1; i >= 0; i--) {
      const key = localStorage.key(i);
      if (key && LEGACY_COPY.test(key)) localStorage.removeItem(key);
    }
  } catch {
    /* storage unavailable: nothing to drop */
  }
}

export function syncLoop(): SyncLoop {
  if (!loop) {
    dropLegacyCopies();
    loop = new SyncLoop(localSyncDb(), httpTransport);
    loop.start();
  }
  return loop;
}

export function useLoopState(): LoopState {
  const [state, setState] = useState<LoopState>({ running: false, online: true, nextRetryAt: null });
  useEffect(() => syncLoop().subscribe(setState), []);
  return state;
}

/**
 * After an online-only screen changed what the pull carries (rules, templates, calibrations,
 * people), a round now, so this tablet's store (and every screen reading it) shows the change.
 */
export function syncSoon(): void {
  syncLoop().request(0);
}
