import { RulesAdmin } from "@/components/safety/rules-admin";
import { NotAllowed } from "@/components/shell/not-allowed";
import { currentUser } from "@/lib/auth/require";

export const metadata = { title: "Facility rules" };
export const dynamic = "force-dynamic";

export default async function RulesPage() {
  const me = await currentUser();
  if (me?.role !== "facility_admin") return <NotAllowed need="facility admin" />;
  return (
    <>
      <h1 className="mb-4 text-3xl font-bold">Facility rules</h1>
      <RulesAdmin />
    </>
  );
}
