// The table of all transfers (or quenches/incidents) with filters and sorting.
import { getDb } from "@/db";
import { auditTable } from "@/db/queries/audit";
import { parseSearch, toFilter } from "@/lib/audit/filter-params";
import { keyDir } from "@/lib/audit/server-tick";
import { requireUser } from "@/lib/auth/require";
import { AppError } from "@/lib/errors";
import { handle, json } from "@/lib/http/respond";
import { formatIssues } from "@/lib/schemas/entry";

export const dynamic = "force-dynamic";

export async function GET(req: Request) {
  return handle(async () => {
    await requireUser("safety_officer", "facility_admin");
    const p = parseSearch(req.url);
    if (!p.success) throw new AppError("bad_request", "audit", "Check the filters.", formatIssues(p.error));
    return json({ items: await auditTable(await getDb(), { ...toFilter(p.data), keyDir: keyDir() }) });
  });
}
