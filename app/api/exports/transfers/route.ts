// CSV of the audit table with the same filters (served as a download).
import { auditTable } from "@/db/queries/audit";
import { filterFromUrl } from "@/lib/audit/filter-params";
import { recordsToCsv } from "@/lib/export/csv";
import { toCsvRecord } from "@/lib/export/records";
import { checkpointKeys } from "@/server/audit/keys";
import { downloadResponse } from "@/server/http/download";
import { route } from "@/server/http/route";

export const dynamic = "force-dynamic";

export const GET = route({ access: ["safety_officer", "facility_admin"], surface: "export" }, async ({ req, db }) => {
  const items = await auditTable(db, { ...filterFromUrl(req.url, "export"), keys: checkpointKeys() });
  const csv = recordsToCsv(items.map(toCsvRecord));
  const fileName = `rimelog-transfers-${new Date().toISOString().slice(0, 10)}.csv`;
  return downloadResponse(`\ufeff${csv}`, { type: "text/csv; charset=utf-8", fileName });
});
