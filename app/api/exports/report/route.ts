// PDF audit report of a period: every transfer, quench and incident with flags, findings and
// signature manifestations, and each chain's check.
import { getDb } from "@/db";
import { auditTable } from "@/db/queries/audit";
import { checkChain, listChains } from "@/db/queries/chain";
import { getRules } from "@/db/queries/rules";
import { filterFromUrl } from "@/lib/audit/filter-params";
import { auditReportPdf } from "@/lib/export/pdf";
import { toReportRecord } from "@/lib/export/records";
import { deferral } from "@/lib/safety/cautions";
import { checkpointKeys } from "@/server/audit/keys";
import { requireUser } from "@/server/auth/require";
import { handle } from "@/server/http/respond";

export const dynamic = "force-dynamic";

export async function GET(req: Request) {
  return handle(async () => {
    const user = await requireUser("safety_officer", "facility_admin");
    const f = filterFromUrl(req.url, "export", "Check the period.");
    const db = await getDb();
    const to = f.to ?? new Date().toISOString();
    const from = f.from ?? new Date(Date.parse(to) - 30 * 86_400_000).toISOString();
    const items = await auditTable(db, {
      ...f,
      from,
      to,
      kinds: f.kinds ?? ["transfer", "quench", "incident"],
      sort: "date",
      dir: "asc",
      keys: checkpointKeys(),
    });
    const chains = [];
    for (const c of await listChains(db)) {
      const r = await checkChain(db, { chain: c.chain, keys: checkpointKeys() });
      chains.push({
        chain: c.chain,
        ok: r.ok,
        count: r.count,
        message: r.ok ? `Signed checkpoints checked: ${r.checkpointsChecked}.` : r.message,
      });
    }
    const rules = await getRules(db);
    const pdf = await auditReportPdf({
      facilityName: rules?.values.facilityName ?? "Facility",
      from,
      to,
      generatedAt: new Date().toISOString(),
      generatedBy: `${user.name} (${user.role.replace("_", " ")})`,
      records: items.map(toReportRecord),
      chains,
      deferral: rules ? deferral(rules.values) : "",
    });
    return new Response(Buffer.from(pdf), {
      headers: {
        "content-type": "application/pdf",
        "content-disposition": `attachment; filename="rimelog-audit-${from.slice(0, 10)}-to-${to.slice(0, 10)}.pdf"`,
        "cache-control": "no-store",
        "x-content-type-options": "nosniff",
      },
    });
  });
}
