import { rolePage } from "@/app/(app)/_components/role-page";
import { AuditHome } from "@/components/audit/audit-home";

export const metadata = { title: "Audit" };
export const dynamic = "force-dynamic";
export default rolePage({
  roles: ["safety_officer", "facility_admin"],
  need: "safety officer",
  title: "Safety audit",
  Screen: AuditHome,
});
