// Entry builders for the tests, one family: `entryInput` (an entry as a tablet sends it, valid by
// default: Tomasz on tablet "tab-1", Wren, no run, written now), `entryBuilder` (the same with a
// test's own defaults and clock), `note`, `localEntry` (the row the tablet store keeps for it),
// and drafts for the tablet store's write path (`readingDraft`, `noteDraft`).
import type { StoredLocalEntry } from "@/lib/local/db";
import type { EntryDraft } from "@/lib/local/store";
import type { EntryInput, EntryInputOf, EntryKind, Payload, UncheckedEntry } from "@/lib/schemas/entry";
import { tomasz } from "./users";

/** An entry's envelope fields (everything but kind and payload), each optional. */
export type Envelope = Partial<Omit<UncheckedEntry, "kind" | "payload">>;
/** What a test says about an entry: at least its kind and the payload typed by that kind; the rest has defaults. */
export type EntryFields<K extends EntryKind = EntryKind> = Envelope & { kind: K; payload: Payload<K> };

/** Everything but id, kind, payload and time. */
export const ENTRY_DEFAULTS = {
  cryostatId: "wren",
  runId: null,
  authorId: tomasz.id,
  deviceId: "tab-1",
  supersedes: null,
  reason: null,
} as const satisfies Partial<EntryInput>;

/** An entry as a tablet pushes it. `at` is its recordedAt (default now); `fields` win over both. */
export function entryInput<K extends EntryKind>(fields: EntryFields<K>, at: Date = new Date()): EntryInputOf<K> {
  // The spread of a generic kind and payload is not narrowed by TypeScript; the fields type holds them together.
  return { id: crypto.randomUUID(), ...ENTRY_DEFAULTS, recordedAt: at.toISOString(), ...fields } as EntryInputOf<K>;
}

/**
 * `entryInput` with a test's own defaults (another cryostat, author, device) and clock: `clock()`
 * gives each entry's recordedAt unless the call passes `at` (see `ticking`).
 */
export function entryBuilder(
  defaults: Envelope,
  clock: () => Date = () => new Date(),
): <K extends EntryKind>(fields: EntryFields<K>, at?: Date) => EntryInputOf<K> {
  return (fields, at) => entryInput({ ...defaults, ...fields }, at ?? clock());
}

/** A clock that moves `stepMs` on each call, the first call included: start + step, start + 2·step… */
export function ticking(start: string | number, stepMs = 60_000): () => Date {
  let t = typeof start === "number" ? start : Date.parse(start);
  return () => {
    t += stepMs;
    return new Date(t);
  };
}

/** A note on Wren (by default) with the text given. */
export function note(text: string, over: Envelope = {}): EntryInputOf<"note"> {
  return entryInput({ kind: "note", payload: { text }, ...over });
}

/** The tablet store's row for an entry: pending until the server's seq, hash and time are given. */
export function localEntry(
  entry: EntryInput,
  server?: { seq: number; hash: string; prevHash: string; receivedAt: string },
): StoredLocalEntry {
  return server
    ? { ...entry, sync: "synced", ...server, rejection: null }
    : { ...entry, sync: "pending", seq: null, hash: null, prevHash: null, receivedAt: null, rejection: null };
}

type ReadingPayload = Extract<EntryDraft, { kind: "reading" }>["payload"];

/** A reading as a form hands it to the tablet store: a temperature in K unless told otherwise. */
export function readingDraft(
  r: { cryostatId: string | null } & Omit<ReadingPayload, "quantity" | "unit"> &
    Partial<Pick<ReadingPayload, "quantity" | "unit">>,
): EntryDraft {
  const { cryostatId, quantity = "Temperature", unit = "K", ...rest } = r;
  return { cryostatId, kind: "reading", payload: { quantity, unit, ...rest } };
}

/** A note as a form hands it to the tablet store. */
export function noteDraft(text: string, cryostatId: string | null = "wren"): EntryDraft {
  return { cryostatId, kind: "note", payload: { text } };
}
