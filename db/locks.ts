// PostgreSQL advisory locks the app takes, as (space, key) pairs of int4 (pg_advisory_lock(int, int)).
// One space for the app, so another application on the same server cannot collide with these keys.
// PGlite runs them too (one process: they never wait).

/** "Rime" in ASCII: the app's lock space. */
export const LOCK_SPACE = 0x52696d65;

export const LOCKS = {
  /**
   * Held for the rest of appendEntries' transaction (pg_advisory_xact_lock): seq is global, so
   * every append is serialised, not only those of one chain; each sees the one before committed.
   */
  append: 1,
  /** Held on a connection of its own by the one process that runs the background tick (server/tick.ts). */
  tick: 2,
  /** Held while a process applies the migrations and seeds an empty database, so two starting at once do not race. */
  migrate: 3,
} as const;
