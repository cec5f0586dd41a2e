// CSV of the audit table with the same filters (served as a download).
import { getDb } from "@/db";
import { auditTable } from "@/db/queries/audit";
import { filterFromUrl } from "@/lib/audit/filter-params";
import { recordsToCsv } from "@/lib/export/csv";
import { toCsvRecord } from "@/lib/export/records";
import { checkpointKeys } from "@/server/audit/keys";
import { requireUser } from "@/server/auth/require";
import { handle } from "@/server/http/respond";

export const dynamic = "force-dynamic";

export async function GET(req: Request) {
  return handle(async () => {
    await requireUser("safety_officer", "facility_admin");
    const items = await auditTable(await getDb(), { ...filterFromUrl(req.url, "export"), keys: checkpointKeys() });
    const csv = recordsToCsv(items.map(toCsvRecord));
    const stamp = new Date().toISOString().slice(0, 10);
    return new Response(`\ufeff${csv}`, {
      headers: {
        "content-type": "text/csv; charset=utf-8",
        "content-disposition": `attachment; filename="rimelog-transfers-${stamp}.csv"`,
        "cache-control": "no-store",
        "x-content-type-options": "nosniff",
      },
    });
  });
}
