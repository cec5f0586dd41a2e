// GET /api/sync/pull?since=SEQ&ref=HASH — entries after the cursor (paged, filtered to what the
// role may read) and, when the tablet's copy is stale, the reference data. Never cached.
import { z } from "zod";
import { getDb } from "@/db";
import { loadReference } from "@/db/queries/reference";
import { AppError } from "@/lib/errors";
import { PULL_PAGE, type PullReply } from "@/lib/sync/protocol";
import { requireUser } from "@/server/auth/require";
import { handle, json } from "@/server/http/respond";
import { pullPage } from "@/server/sync/apply";
import { ensureServerTick } from "@/server/tick";

export const dynamic = "force-dynamic";

const query = z.object({
  since: z.coerce.number().int().min(0).default(0),
  limit: z.coerce.number().int().min(1).max(PULL_PAGE).default(PULL_PAGE),
  ref: z.string().max(100).optional(),
});

export async function GET(req: Request) {
  return handle(async () => {
    const user = await requireUser();
    const q = query.safeParse(Object.fromEntries(new URL(req.url).searchParams));
    if (!q.success) throw new AppError("bad_request", "cursor", "The pull cursor `since` must be a whole number ≥ 0.");
    const db = await getDb();
    const page = await pullPage(db, user, q.data);
    let reference: PullReply["reference"] = null;
    if (q.data.ref !== undefined) {
      const ref = await loadReference(db);
      if (ref.hash !== q.data.ref) reference = ref;
    }
    const reply: PullReply = { ...page, reference, me: user };
    ensureServerTick();
    return json(reply);
  });
}
