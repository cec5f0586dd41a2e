import { z } from "zod";
import { getDb } from "@/db";
import { getRunRecord, listRuns } from "@/db/queries/runs";
import { AppError } from "@/lib/errors";
import { requireUser } from "@/server/auth/require";
import { handle, json } from "@/server/http/respond";

export const dynamic = "force-dynamic";

const query = z.object({
  id: z.uuid().optional(),
  cryostatId: z.string().min(1).max(60).optional(),
  status: z.enum(["open", "completed", "aborted"]).optional(),
});

/** Runs (list) or one run with its entries and pinned template (?id=). Runs are written by pushing entries. */
export async function GET(req: Request) {
  return handle(async () => {
    await requireUser();
    const q = query.safeParse(Object.fromEntries(new URL(req.url).searchParams));
    if (!q.success) throw new AppError("bad_request", "run", "Unknown query.");
    const db = await getDb();
    if (q.data.id) {
      const record = await getRunRecord(db, { runId: q.data.id });
      if (!record) throw new AppError("not_found", "run", "No such run on the server (it may not have synced yet).");
      return json(record);
    }
    return json({ runs: await listRuns(db, { cryostatId: q.data.cryostatId, status: q.data.status }) });
  });
}
