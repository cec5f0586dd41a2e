"use client";
// The page's one sync loop (browser transport on the tablet store), started on first use, and a
// hook for its live state (a round running, online/offline, next retry).
import { useEffect, useState } from "react";
import { localSyncDb } from "@/lib/local/db";
import { httpTransport } from "@/lib/sync/http";
import { type LoopState, SyncLoop } from "@/lib/sync/loop";

let loop: SyncLoop | undefined;

export function syncLoop(): SyncLoop {
  if (!loop) {
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
