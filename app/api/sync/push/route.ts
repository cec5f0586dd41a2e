// POST /api/sync/push — a batch of entries from a tablet. Same-origin JSON only, bounded in
// entries and bytes (413), each entry validated and role-checked, the batch applied in one
// transaction, idempotent by entry id. Answers accepted (id, seq, hash) and rejected (id, code, message).
import { getDb } from "@/db";
import { PUSH_LIMITS } from "@/lib/sync/protocol";
import { requireUser } from "@/server/auth/require";
import { handle, json, readJson } from "@/server/http/respond";
import { applyPush } from "@/server/sync/apply";
import { ensureServerTick, kickServerTick } from "@/server/tick";

export const dynamic = "force-dynamic";

export async function POST(req: Request) {
  return handle(async () => {
    const t0 = performance.now();
    const user = await requireUser();
    const t1 = performance.now();
    const body = await readJson(req, PUSH_LIMITS.maxBytes);
    const t2 = performance.now();
    const reply = await applyPush(await getDb(), user, body);
    const t3 = performance.now();
    // Sign moved chain heads and send queued mail soon (the timer keeps running after that).
    ensureServerTick();
    if (reply.accepted.length) kickServerTick();
    const res = json(reply);
    // Where the server's time went (Server-Timing, read by bench/sync and the browser's devtools).
    res.headers.set(
      "Server-Timing",
      `auth;dur=${(t1 - t0).toFixed(1)}, read;dur=${(t2 - t1).toFixed(1)}, apply;dur=${(t3 - t2).toFixed(1)}`,
    );
    return res;
  });
}
