// PDF audit report of a period: every transfer, quench and incident with flags, findings and
// signature manifestations, and each chain's check.
import { auditReport } from "@/server/audit/report";
import { downloadResponse } from "@/server/http/download";
import { route } from "@/server/http/route";

export const dynamic = "force-dynamic";

export const GET = route(
  { access: ["safety_officer", "facility_admin"], surface: "export" },
  async ({ req, db, user }) => {
    const { pdf, from, to } = await auditReport(db, user, req.url);
    const fileName = `rimelog-audit-${from.slice(0, 10)}-to-${to.slice(0, 10)}.pdf`;
    return downloadResponse(pdf, { type: "application/pdf", fileName });
  },
);
