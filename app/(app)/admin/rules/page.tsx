import { rolePage } from "@/app/(app)/_components/role-page";
import { RulesAdmin } from "@/components/safety/rules-admin";

export const metadata = { title: "Facility rules" };
export const dynamic = "force-dynamic";
export default rolePage({
  roles: ["facility_admin"],
  need: "facility admin",
  title: "Facility rules",
  Screen: RulesAdmin,
});
