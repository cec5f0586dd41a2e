import { MailAdmin } from "@/components/audit/mail-admin";
import { NotAllowed } from "@/components/shell/not-allowed";
import { currentUser } from "@/lib/auth/require";

export const metadata = { title: "Mail outbox" };
export const dynamic = "force-dynamic";

export default async function MailPage() {
  const me = await currentUser();
  if (me?.role !== "facility_admin") return <NotAllowed need="facility admin" />;
  return (
    <>
      <h1 className="mb-4 text-3xl font-bold">Mail outbox</h1>
      <MailAdmin />
    </>
  );
}
