"use client";
// Service worker registration (Serwist's window package, the same stack as sw/sw.ts) and the
// "new version ready" signal, plus the persistent-storage request. Each runs once per page.
import type { Serwist } from "@serwist/window";
import { useEffect, useState } from "react";

let wbPromise: Promise<Serwist | null> | undefined;
const waitingListeners = new Set<(w: boolean) => void>();
let waiting = false;

function register(): Promise<Serwist | null> {
  if (typeof window === "undefined" || !("serviceWorker" in navigator) || process.env.NODE_ENV !== "production")
    return Promise.resolve(null);
  wbPromise ??= import("@serwist/window").then(async ({ Serwist }) => {
    const wb = new Serwist("/sw.js", { scope: "/" });
    wb.addEventListener("waiting", () => {
      waiting = true;
      for (const f of waitingListeners) f(true);
    });
    // Once the new worker has taken over (after "New version: reload" sent it SKIP_WAITING, which
    // sw/sw.ts answers with skipWaiting()), load the page from it.
    wb.addEventListener("controlling", (e) => {
      if (e.isUpdate) window.location.reload();
    });
    await wb.register();
    return wb;
  });
  return wbPromise;
}

/** Registers the service worker; returns whether a new version waits, and how to switch to it. */
export function useServiceWorker(): { updateReady: boolean; applyUpdate: () => void } {
  const [ready, setReady] = useState(waiting);
  useEffect(() => {
    void register().catch((e) => console.warn("[rimelog] service worker registration failed", e));
    waitingListeners.add(setReady);
    return () => {
      waitingListeners.delete(setReady);
    };
  }, []);
  return {
    updateReady: ready,
    applyUpdate: () => {
      void register().then((wb) => (wb ? wb.messageSkipWaiting() : window.location.reload()));
    },
  };
}

export type PersistState = "granted" | "denied" | "unsupported" | "unknown";
let persistPromise: Promise<PersistState> | undefined;

/** Asks once for persistent storage (so the browser does not evict unsent entries) and reports it. */
export function usePersistentStorage(): PersistState {
  const [state, setState] = useState<PersistState>("unknown");
  useEffect(() => {
    persistPromise ??= (async () => {
      const s = navigator.storage;
      if (!s?.persist || !s.persisted) return "unsupported";
      if (await s.persisted()) return "granted";
      return (await s.persist()) ? "granted" : "denied";
    })().catch(() => "unsupported" as const);
    let live = true;
    void persistPromise.then((v) => live && setState(v));
    return () => {
      live = false;
    };
  }, []);
  return state;
}
