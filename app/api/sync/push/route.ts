// POST /api/sync/push — a batch of entries from a tablet. Same-origin JSON only, bounded in
// entries and bytes (413), each entry validated and role-checked, the batch applied in one
// transaction, idempotent by entry id. Answers accepted (id, seq, hash) and rejected (id, code, message).
import { PUSH_LIMITS } from "@/lib/sync/protocol";
import { json } from "@/server/http/respond";
import { route } from "@/server/http/route";
import { applyPush } from "@/server/sync/apply";
import { ensureServerTick, kickServerTick } from "@/server/tick";

export const dynamic = "force-dynamic";

export const POST = route(
  { access: "signed-in", surface: "sync", body: "json", maxBytes: PUSH_LIMITS.maxBytes },
  async ({ db, user, body, timings }) => {
    const t0 = performance.now();
    const reply = await applyPush(db, user, body);
    const apply = performance.now() - t0;
    // Sign moved chain heads and send queued mail soon (the timer keeps running after that).
    ensureServerTick();
    if (reply.accepted.length) kickServerTick();
    const res = json(reply);
    // Where the server's time went (Server-Timing, read by bench/sync and the browser's devtools).
    const { auth, read } = timings;
    res.headers.set(
      "Server-Timing",
      `auth;dur=${auth.toFixed(1)}, read;dur=${read.toFixed(1)}, apply;dur=${apply.toFixed(1)}`,
    );
    return res;
  },
);
