// The officer's finding and its `audited` signature, written together (online). Both are ordinary
// log entries through the one append path: the server re-checks the role, the signature's hash
// binding and its PIN/password proof, exactly as for a tablet push.
import { z } from "zod";
import { getDb } from "@/db";
import { appendEntries } from "@/db/queries/entries";
import { AppError } from "@/lib/errors";
import { parseEntry } from "@/lib/schemas/entry";
import { requireUser } from "@/server/auth/require";
import { handle, json, readJson } from "@/server/http/respond";
import { kickServerTick } from "@/server/tick";

export const dynamic = "force-dynamic";

const bodySchema = z.object({ finding: z.unknown(), signature: z.unknown() });

export async function POST(req: Request) {
  return handle(async () => {
    const user = await requireUser("safety_officer");
    const body = bodySchema.safeParse(await readJson(req, 600_000));
    if (!body.success) throw new AppError("bad_request", "audit", "Send the finding and its signature.");
    const finding = parseEntry(body.data.finding);
    const signature = parseEntry(body.data.signature);
    if (!finding.ok) throw new AppError("bad_request", "audit", "The finding is not valid.", finding.problems);
    if (!signature.ok) throw new AppError("bad_request", "audit", "The signature is not valid.", signature.problems);
    if (finding.entry.kind !== "audit.finding")
      throw new AppError("bad_request", "audit", "The first entry must be an audit finding.");
    const sp = signature.entry.payload as { signedEntryId: string; meaning: string };
    if (signature.entry.kind !== "signature" || sp.meaning !== "audited" || sp.signedEntryId !== finding.entry.id) {
      throw new AppError("bad_request", "audit", "The signature must be an 'audited' signature on this finding.");
    }
    const res = await appendEntries(await getDb(), user, [finding.entry, signature.entry]);
    if (res.rejected.length) throw new AppError("bad_request", "audit", res.rejected.map((r) => r.message).join(" "));
    kickServerTick();
    return json({ accepted: res.accepted }, 201);
  });
}
