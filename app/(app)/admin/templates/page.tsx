import { rolePage } from "@/app/(app)/_components/role-page";
import { TemplateAdmin } from "@/components/procedures/template-admin";

export const metadata = { title: "Procedure templates" };
export const dynamic = "force-dynamic";

export default rolePage({
  roles: ["facility_admin"],
  need: "facility admin",
  title: "Procedure templates",
  Screen: TemplateAdmin,
});
