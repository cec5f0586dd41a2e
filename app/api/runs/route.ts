// Runs (list) or one run with its entries and pinned template (?id=). Runs are written by pushing entries.
import { z } from "zod";
import { getRunRecord, listRuns } from "@/db/queries/runs";
import { AppError } from "@/lib/errors";
import { json } from "@/server/http/respond";
import { route } from "@/server/http/route";

export const dynamic = "force-dynamic";

const query = z.object({
  id: z.uuid().optional(),
  cryostatId: z.string().min(1).max(60).optional(),
  status: z.enum(["open", "completed", "aborted"]).optional(),
});

export const GET = route(
  { access: "signed-in", surface: "run", query, invalid: "Unknown query." },
  async ({ db, query: { id, cryostatId, status } }) => {
    if (!id) return json({ runs: await listRuns(db, { cryostatId, status }) });
    const record = await getRunRecord(db, { runId: id });
    if (!record) throw new AppError("not_found", "run", "No such run on the server (it may not have synced yet).");
    return json(record);
  },
);
