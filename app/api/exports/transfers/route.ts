// CSV of the audit table with the same filters (served as a download).
import { getDb } from "@/db";
import { auditTable } from "@/db/queries/audit";
import { filterFromUrl } from "@/lib/audit/filter-params";
import { keyDir } from "@/lib/audit/server-tick";
import { requireUser } from "@/lib/auth/require";
import { recordsToCsv } from "@/lib/export/csv";
import { toCsvRecord } from "@/lib/export/records";
import { handle } from "@/lib/http/respond";

export const dynamic = "force-dynamic";

export async function GET(req: Request) {
  return handle(async () => {
    await requireUser("safety_officer", "facility_admin");
    const items = await auditTable(await getDb(), { ...filterFromUrl(req.url, "export"), keyDir: keyDir() });
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
