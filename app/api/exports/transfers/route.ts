// CSV of the audit table with the same filters (served as a download).
import { getDb } from "@/db";
import { auditTable } from "@/db/queries/audit";
import { parseSearch, toFilter } from "@/lib/audit/filter-params";
import { keyDir } from "@/lib/audit/server-tick";
import { requireUser } from "@/lib/auth/require";
import { AppError } from "@/lib/errors";
import { recordsToCsv } from "@/lib/export/csv";
import { toCsvRecord } from "@/lib/export/records";
import { handle } from "@/lib/http/respond";
import { formatIssues } from "@/lib/schemas/entry";

export const dynamic = "force-dynamic";

export async function GET(req: Request) {
  return handle(async () => {
    await requireUser("safety_officer", "facility_admin");
    const p = parseSearch(req.url);
    if (!p.success) throw new AppError("bad_request", "export", "Check the filters.", formatIssues(p.error));
    const items = await auditTable(await getDb(), { ...toFilter(p.data), keyDir: keyDir() });
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
