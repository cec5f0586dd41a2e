import { rolePage } from "@/app/(app)/_components/role-page";
import { DevicesAdmin } from "@/components/admin/devices-admin";

export const metadata = { title: "Tablets" };
export const dynamic = "force-dynamic";
export default rolePage({ roles: ["facility_admin"], need: "facility admin", title: "Tablets", Screen: DevicesAdmin });
