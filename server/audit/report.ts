// The PDF audit report of a period (GET /api/exports/report): every transfer, quench and incident
// of the period with flags, findings and signature manifestations, and each chain's check.
import "server-only";
import type { Db } from "@/db";
import { auditTable } from "@/db/queries/audit";
import { checkChain, listChains } from "@/db/queries/chain";
import { getRules } from "@/db/queries/rules";
import { filterFromUrl } from "@/lib/audit/filter-params";
import { auditReportPdf } from "@/lib/export/pdf";
import { toReportRecord } from "@/lib/export/records";
import { deferral } from "@/lib/safety/cautions";
import type { SessionUser } from "@/lib/schemas/user";
import { checkpointKeys } from "./keys";

const DAY_MS = 86_400_000;

/** The report for the filters in `url` (period: `from`/`to`, by default the 30 days up to now). */
export async function auditReport(db: Db, user: SessionUser, url: string) {
  const f = filterFromUrl(url, "export", "Check the period.");
  const to = f.to ?? new Date().toISOString();
  const from = f.from ?? new Date(Date.parse(to) - 30 * DAY_MS).toISOString();
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
    const message = r.ok ? `Signed checkpoints checked: ${r.checkpointsChecked}.` : r.message;
    chains.push({ chain: c.chain, ok: r.ok, count: r.count, message });
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
  return { pdf, from, to };
}
