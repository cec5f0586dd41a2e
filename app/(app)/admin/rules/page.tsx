import { rolePage } from "@/components/admin/role-page";
import { RulesAdmin } from "@/components/safety/rules-admin";

export const metadata = { title: "Facility rules" };
export const dynamic = "force-dynamic";
export default rolePage({
  roles: ["facility_admin"],
  need: "facility admin",
  title: "Facility rules",
  Screen: RulesAdmin,
});
