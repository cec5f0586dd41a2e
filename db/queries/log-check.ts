// The shape of a check a pushed entry must pass against the stored log (signature binding,
// corrections, procedure runs, audit findings). Each check names the entries it looks at, so an
// entry no check looks at (a reading, a note: most of a long push) is accepted without a query.
// Types only: the checks live with their feature (runs.ts, audit.ts, projections.ts).
import type { Db } from "@/db/client";
import type { EntryInput } from "@/lib/schemas/entry";
import type { SessionUser } from "@/lib/schemas/user";

export type Problem = { code: string; message: string };

export type LogCheck = {
  /** True for the entries this check looks at; the others are not passed to it. */
  when: (e: EntryInput) => boolean;
  check: (db: Db, e: EntryInput, batch: Map<string, EntryInput>, user: SessionUser) => Promise<Problem | null>;
};

export const ofKind =
  (...kinds: string[]) =>
  (e: EntryInput): boolean =>
    kinds.includes(e.kind);
