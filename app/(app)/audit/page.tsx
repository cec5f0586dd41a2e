import { AuditHome } from "@/components/audit/audit-home";
import { NotAllowed } from "@/components/shell/not-allowed";
import { currentUser } from "@/lib/auth/require";

export const metadata = { title: "Audit" };
export const dynamic = "force-dynamic";

export default async function AuditPage() {
  const me = await currentUser();
  if (me?.role !== "safety_officer" && me?.role !== "facility_admin") return <NotAllowed need="safety officer" />;
  return (
    <>
      <h1 className="mb-4 text-3xl font-bold">Safety audit</h1>
      <AuditHome />
    </>
  );
}
