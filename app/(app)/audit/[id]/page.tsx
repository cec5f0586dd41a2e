import { RolePage } from "@/app/(app)/_components/role-page";
import { AuditRecord } from "@/components/audit/audit-record";

export const metadata = { title: "Audit a record" };
export const dynamic = "force-dynamic";

export default async function AuditRecordPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  return (
    <RolePage roles={["safety_officer", "facility_admin"]} need="safety officer" title="Audit a record">
      <AuditRecord id={id} />
    </RolePage>
  );
}
