// The shape of a check a pushed entry must pass against the stored log (signature binding,
// corrections, procedure runs, audit findings). Each check names the entries it looks at, so an
// entry no check looks at (a reading, a note: most of a long push) is accepted without a query.
// The checks live with their feature (runs.ts, audit.ts, projections.ts); here only their shape.
import { eq } from "drizzle-orm";
import type { Db } from "@/db/client";
import { entries } from "@/db/schema";
import { type EntryInput, type EntryKind, isKindOf, type StoredEntry } from "@/lib/schemas/entry";
import type { SessionUser } from "@/lib/schemas/user";
import { toStoredRow } from "./stored";

export type Problem = { code: string; message: string };

/** An entry a check names: from the batch if it came with it, else from the stored log. */
export async function findEntry(db: Db, id: string, batch: Map<string, EntryInput>): Promise<EntryInput | undefined> {
  const inBatch = batch.get(id);
  if (inBatch) return inBatch;
  const [row] = await db.select().from(entries).where(eq(entries.id, id));
  return row ? toStoredRow(row) : undefined;
}

/**
 * A check of the entries of some kinds: it is handed the entry typed by its kind, the entries of
 * the batch accepted before it (`batch`, by id) and the entries after it, not yet checked
 * (`ahead`: where a signature sent with the entry is found).
 */
export type Check<E extends EntryInput = EntryInput> = (
  db: Db,
  e: E,
  batch: Map<string, EntryInput>,
  user: SessionUser,
  ahead: readonly EntryInput[],
) => Promise<Problem | null>;

export type LogCheck = {
  /** True for the entries this check looks at; the others are not passed to it. */
  when: (e: EntryInput) => boolean;
  check: Check;
};

/** A check that looks at the entries of the given kinds only (each typed by its kind). */
export function forKinds<K extends EntryKind>(
  kinds: readonly K[],
  check: Check<Extract<EntryInput, { kind: K }>>,
): LogCheck {
  return {
    when: (e) => isKindOf(e, kinds),
    check: async (db, e, batch, user, ahead) => (isKindOf(e, kinds) ? check(db, e, batch, user, ahead) : null),
  };
}

/** Updates a projection (runs, signatures, mail) in the transaction that writes the entries it is handed. */
export type Projector = (db: Db, rows: StoredEntry[]) => Promise<void>;
