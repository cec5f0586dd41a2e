// Server side of sync, without HTTP: apply a pushed body for a user, and read a pull page.
// Route handlers (app/api/sync) and the reliability tests call exactly these functions.
import "server-only";
import type { Db } from "@/db/client";
import { deviceStandings, markDevicesSeen } from "@/db/queries/devices";
import { appendEntries, pullEntries } from "@/db/queries/entries";
import { deviceRefusal } from "@/lib/schemas/device";
import type { EntryInput } from "@/lib/schemas/entry";
import type { SessionUser } from "@/lib/schemas/user";
import { PULL_PAGE, type PushReply, parsePushBody, type Rejected } from "@/lib/sync/protocol";

/**
 * Apply a push. Each of the user's own entries must come from a registered, not-withdrawn device
 * the user has signed in on (lib/schemas/device.ts `deviceRefusal`); one that does not is refused
 * alone and the rest of the batch is stored. Entries naming another author are left to
 * appendEntries, which refuses them as not the session's own.
 */
export async function applyPush(db: Db, user: SessionUser, body: unknown): Promise<PushReply> {
  const { entries, rejected } = parsePushBody(body);
  const standings = await deviceStandings(db, [...new Set(entries.map((e) => e.deviceId))]);
  const allowed: EntryInput[] = [];
  const refused: Rejected[] = [];
  for (const e of entries) {
    const problem = e.authorId === user.id ? deviceRefusal(e, standings.get(e.deviceId)) : null;
    if (problem) refused.push({ id: e.id, ...problem });
    else allowed.push(e);
  }
  const res = await appendEntries(db, user, allowed);
  if (res.accepted.length) {
    const accepted = new Set(res.accepted.map((a) => a.id));
    await markDevicesSeen(db, [...new Set(allowed.filter((e) => accepted.has(e.id)).map((e) => e.deviceId))]);
  }
  return { accepted: res.accepted, rejected: [...rejected, ...refused, ...res.rejected] };
}

export async function pullPage(
  db: Db,
  user: SessionUser,
  { since, limit = PULL_PAGE }: { since: number; limit?: number },
) {
  return pullEntries(db, { since, role: user.role, limit });
}
