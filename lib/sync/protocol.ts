// The sync protocol's shapes and bounds, shared by the tablet and the server: what a push sends
// and gets back, what a pull returns, and how a push body is checked entry by entry.

import { AppError } from "@/lib/errors";
import type { CalibrationRecord } from "@/lib/schemas/calibration";
import { type EntryInput, parseEntry, type StoredEntry } from "@/lib/schemas/entry";
import type { RulesInForce } from "@/lib/schemas/rules";
import type { SessionUser } from "@/lib/schemas/user";

/** A push carries at most this many entries and bytes; over it the server answers 413. */
export const PUSH_LIMITS = { maxEntries: 2000, maxBytes: 4_000_000 } as const;
/** Entries per pull page (the server may answer fewer). */
export const PULL_PAGE = 500;

/** An entry the server holds: its place in the log (seq, chain link) and when it arrived. */
export type Accepted = { id: string; seq: number; hash: string; prevHash: string; receivedAt: string };
export type Rejected = { id: string; code: string; message: string };
export type PushReply = { accepted: Accepted[]; rejected: Rejected[] };

/** What a tablet keeps for offline use, sent by the pull when the tablet's copy (by hash) is stale. */
export type ReferenceData = {
  hash: string;
  cryostats: ({ id: string } & Record<string, unknown>)[];
  /** Every version of every procedure template (a run pins the version it started from). */
  templates: ({ id: string } & Record<string, unknown>)[];
  /** The facility rules in force, with the rules document's metadata; null while never set. */
  rules: RulesInForce | null;
  /**
   * The sensor calibration tables in force (the newest accepted per cryostat and stage). Optional
   * on the wire: a server from before it was added sends none, and a tablet from before ignores it.
   */
  calibrations?: CalibrationRecord[];
  users: ({ id: string } & Record<string, unknown>)[];
};

export type PullReply = {
  entries: StoredEntry[];
  cursor: number;
  hasMore: boolean;
  /** Present when the tablet's copy (by hash) is out of date, or it asked without one. */
  reference: ReferenceData | null;
  /** Who the server says is signed in: refreshes the tablet's offline session. */
  me: SessionUser;
};

export type UploadReply = { id: string; bytes: number; mime: string; sha256: string };

function idOf(raw: unknown, index: number): string {
  const id = (raw as { id?: unknown } | null)?.id;
  return typeof id === "string" && id.length > 0 && id.length <= 100 ? id : `#${index}`;
}

/**
 * Check a push body: garbage as a whole is a 400, too many entries a 413; a malformed entry is
 * answered as rejected (with its reason) and does not fail the others.
 */
export function parsePushBody(body: unknown): { entries: EntryInput[]; rejected: Rejected[] } {
  const list = (body as { entries?: unknown } | null)?.entries;
  if (!body || typeof body !== "object" || !Array.isArray(list)) {
    throw new AppError("bad_request", "sync", 'A push is a JSON object { "entries": [ … ] }.');
  }
  if (list.length > PUSH_LIMITS.maxEntries) {
    throw new AppError(
      "too_large",
      "sync",
      `This push holds ${list.length} entries; at most ${PUSH_LIMITS.maxEntries} are accepted at a time. Send them in smaller batches.`,
    );
  }
  const entries: EntryInput[] = [];
  const rejected: Rejected[] = [];
  list.forEach((raw, i) => {
    let parsed: ReturnType<typeof parseEntry>;
    try {
      parsed = parseEntry(raw);
    } catch {
      // A schema that throws on odd input must still not fail the other entries.
      parsed = { ok: false, problems: ["the entry could not be read"] };
    }
    if (parsed.ok) entries.push(parsed.entry);
    else
      rejected.push({
        id: idOf(raw, i),
        code: "bad_request:entry",
        message: `The entry is not valid: ${parsed.problems.join("; ")}`,
      });
  });
  return { entries, rejected };
}
