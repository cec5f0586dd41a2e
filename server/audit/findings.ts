// The officer's finding and its `audited` signature (POST /api/audit/findings), written together.
// Both are ordinary log entries through the one append path: appendEntries re-checks the role, the
// signature's hash binding and its PIN/password proof, exactly as for a tablet push.
import "server-only";
import type { Db } from "@/db";
import { appendEntries } from "@/db/queries/entries";
import { AppError } from "@/lib/errors";
import { type EntryInput, parseEntry } from "@/lib/schemas/entry";
import type { SessionUser } from "@/lib/schemas/user";
import { kickServerTick } from "@/server/tick";

function entryOf(raw: unknown, what: string): EntryInput {
  const parsed = parseEntry(raw);
  if (!parsed.ok) throw new AppError("bad_request", "audit", `The ${what} is not valid.`, parsed.problems);
  return parsed.entry;
}

export async function recordFinding(db: Db, officer: SessionUser, body: { finding: unknown; signature: unknown }) {
  const finding = entryOf(body.finding, "finding");
  const signature = entryOf(body.signature, "signature");
  if (finding.kind !== "audit.finding")
    throw new AppError("bad_request", "audit", "The first entry must be an audit finding.");
  if (
    signature.kind !== "signature" ||
    signature.payload.meaning !== "audited" ||
    signature.payload.signedEntryId !== finding.id
  ) {
    throw new AppError("bad_request", "audit", "The signature must be an 'audited' signature on this finding.");
  }
  const res = await appendEntries(db, officer, [finding, signature]);
  if (res.rejected.length) throw new AppError("bad_request", "audit", res.rejected.map((r) => r.message).join(" "));
  // Sign the moved chain head and send the finding's mail soon.
  kickServerTick();
  return res.accepted;
}
