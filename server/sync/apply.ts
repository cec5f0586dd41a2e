// Server side of sync, without HTTP: apply a pushed body for a user, and read a pull page.
// Route handlers (app/api/sync) and the reliability tests call exactly these functions.
import "server-only";
import type { Db } from "@/db/client";
import { appendEntries, pullEntries } from "@/db/queries/entries";
import type { SessionUser } from "@/lib/schemas/user";
import { PULL_PAGE, type PushReply, parsePushBody } from "@/lib/sync/protocol";

export async function applyPush(db: Db, user: SessionUser, body: unknown): Promise<PushReply> {
  const { entries, rejected } = parsePushBody(body);
  const res = await appendEntries(db, user, entries);
  return { accepted: res.accepted, rejected: [...rejected, ...res.rejected] };
}

export async function pullPage(
  db: Db,
  user: SessionUser,
  { since, limit = PULL_PAGE }: { since: number; limit?: number },
) {
  return pullEntries(db, { since, role: user.role, limit });
}
