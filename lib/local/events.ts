// A tiny in-page signal: "something was just written locally", so the sync loop can push soon.
// Kept apart from lib/sync so the store never depends on the sync client.
type Listener = () => void;
const listeners = new Set<Listener>();

export function onLocalWrite(fn: Listener): () => void {
  listeners.add(fn);
  return () => listeners.delete(fn);
}

export function emitLocalWrite(): void {
  for (const fn of listeners) {
    try {
      fn();
    } catch {
      /* a listener's failure must not turn a saved entry into an error */
    }
  }
}
