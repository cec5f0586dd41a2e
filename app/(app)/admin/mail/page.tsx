import { rolePage } from "@/app/(app)/_components/role-page";
import { MailAdmin } from "@/components/audit/mail-admin";

export const metadata = { title: "Mail outbox" };
export const dynamic = "force-dynamic";
export default rolePage({ roles: ["facility_admin"], need: "facility admin", title: "Mail outbox", Screen: MailAdmin });
