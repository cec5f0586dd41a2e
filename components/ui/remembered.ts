// Small values a screen keeps in this browser's localStorage for offline use (the signed-in user,
// the facility rules). Storage can be full, disabled or hold junk: every call fails quietly.

/** The value stored under `key`, or null when there is none or it cannot be read. */
export function recall<T>(key: string): T | null {
  try {
    const raw = localStorage.getItem(key);
    return raw ? (JSON.parse(raw) as T) : null;
  } catch {
    return null;
  }
}

/** Store `value` under `key`; on failure the next fetch brings it again. */
export function remember(key: string, value: unknown): void {
  try {
    localStorage.setItem(key, JSON.stringify(value));
  } catch {
    /* storage full or disabled */
  }
}

export function forget(key: string): void {
  try {
    localStorage.removeItem(key);
  } catch {
    /* nothing stored */
  }
}
