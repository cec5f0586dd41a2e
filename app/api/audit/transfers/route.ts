// The table of all transfers (or quenches/incidents) with filters and sorting.
import { getDb } from "@/db";
import { auditTable } from "@/db/queries/audit";
import { filterFromUrl } from "@/lib/audit/filter-params";
import { checkpointKeys } from "@/server/audit/keys";
import { requireUser } from "@/server/auth/require";
import { handle, json } from "@/server/http/respond";

export const dynamic = "force-dynamic";

export async function GET(req: Request) {
  return handle(async () => {
    await requireUser("safety_officer", "facility_admin");
    return json({
      items: await auditTable(await getDb(), { ...filterFromUrl(req.url, "audit"), keys: checkpointKeys() }),
    });
  });
}
