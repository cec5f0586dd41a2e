// POST /api/sync/push — a batch of entries from a tablet. Same-origin JSON only, bounded in
// entries and bytes (413), each entry validated and role-checked, the batch applied in one
// transaction, idempotent by entry id. Answers accepted (id, seq, hash) and rejected (id, code, message).
import { getDb } from "@/db";
import { requireUser } from "@/lib/auth/require";
import { ensureServerTick, kickServerTick } from "@/lib/audit/server-tick";
import { handle, json, readJson } from "@/lib/http/respond";
import { PUSH_LIMITS } from "@/lib/sync/protocol";
import { applyPush } from "@/lib/sync/server";

export const dynamic = "force-dynamic";

export async function POST(req: Request) {
  return handle(async () => {
    const user = await requireUser();
    const body = await readJson(req, PUSH_LIMITS.maxBytes);
    const reply = await applyPush(await getDb(), user, body);
    // Sign moved chain heads and send queued mail soon (the timer keeps running after that).
    ensureServerTick();
    if (reply.accepted.length) kickServerTick();
    return json(reply);
  });
}
