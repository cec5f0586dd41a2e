import { AuditRecord } from "@/components/audit/audit-record";
import { NotAllowed } from "@/components/shell/not-allowed";
import { currentUser } from "@/lib/auth/require";

export const metadata = { title: "Audit a record" };
export const dynamic = "force-dynamic";

export default async function AuditRecordPage({ params }: { params: Promise<{ id: string }> }) {
  const me = await currentUser();
  if (me?.role !== "safety_officer" && me?.role !== "facility_admin") return <NotAllowed need="safety officer" />;
  const { id } = await params;
  return (
    <>
      <h1 className="mb-4 text-3xl font-bold">Audit a record</h1>
      <AuditRecord id={id} />
    </>
  );
}
