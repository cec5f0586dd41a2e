import { UsersAdmin } from "@/components/admin/users-admin";
import { NotAllowed } from "@/components/shell/not-allowed";
import { currentUser } from "@/server/auth/require";

export const metadata = { title: "People and roles" };
export const dynamic = "force-dynamic";

export default async function UsersPage() {
  const me = await currentUser();
  if (me?.role !== "facility_admin") return <NotAllowed need="facility admin" />;
  return (
    <>
      <h1 className="mb-4 text-3xl font-bold">People and roles</h1>
      <UsersAdmin />
    </>
  );
}
