// GET /api/sync/pull?since=SEQ&ref=HASH — entries after the cursor (paged, filtered to what the
// role may read) and, when the tablet's copy is stale, the reference data. Never cached.
import { z } from "zod";
import { loadReference } from "@/db/queries/reference";
import { PULL_PAGE, type PullReply } from "@/lib/sync/protocol";
import { json } from "@/server/http/respond";
import { route } from "@/server/http/route";
import { pullPage } from "@/server/sync/apply";
import { ensureServerTick } from "@/server/tick";

export const dynamic = "force-dynamic";

const query = z.object({
  since: z.coerce.number().int().min(0).default(0),
  limit: z.coerce.number().int().min(1).max(PULL_PAGE).default(PULL_PAGE),
  ref: z.string().max(100).optional(),
});

export const GET = route(
  {
    access: "signed-in",
    surface: "cursor",
    query,
    invalid: "The pull cursor `since` must be a whole number ≥ 0.",
  },
  async ({ db, user, query: q }) => {
    const page = await pullPage(db, user, q);
    let reference: PullReply["reference"] = null;
    if (q.ref !== undefined) {
      const ref = await loadReference(db);
      if (ref.hash !== q.ref) reference = ref;
    }
    const reply: PullReply = { ...page, reference, me: user };
    ensureServerTick();
    return json(reply);
  },
);
