// The officer's finding and its `audited` signature, written together (online). Both are ordinary
// log entries through the one append path: the server re-checks the role, the signature's hash
// binding and its PIN/password proof, exactly as for a tablet push.
import { z } from "zod";
import { appendEntries } from "@/db/queries/entries";
import { AppError } from "@/lib/errors";
import { type EntryInput, parseEntry } from "@/lib/schemas/entry";
import { json } from "@/server/http/respond";
import { route } from "@/server/http/route";
import { kickServerTick } from "@/server/tick";

export const dynamic = "force-dynamic";

const bodySchema = z.object({ finding: z.unknown(), signature: z.unknown() });

function entryOf(raw: unknown, what: string): EntryInput {
  const parsed = parseEntry(raw);
  if (!parsed.ok) throw new AppError("bad_request", "audit", `The ${what} is not valid.`, parsed.problems);
  return parsed.entry;
}

export const POST = route(
  {
    access: ["safety_officer"],
    surface: "audit",
    body: bodySchema,
    maxBytes: 600_000,
    invalid: "Send the finding and its signature.",
  },
  async ({ db, user, body }) => {
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
    const res = await appendEntries(db, user, [finding, signature]);
    if (res.rejected.length) throw new AppError("bad_request", "audit", res.rejected.map((r) => r.message).join(" "));
    kickServerTick();
    return json({ accepted: res.accepted }, 201);
  },
);
