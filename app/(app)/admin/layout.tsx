// Every admin page is for the facility admin, checked here on the server (as well as by each page
// and by proxy.ts), so a new admin page cannot be left open by mistake.
import type { ReactNode } from "react";
import { NotAllowed } from "@/components/shell/not-allowed";
import { currentUser } from "@/server/auth/require";

export const dynamic = "force-dynamic";

export default async function AdminLayout({ children }: { children: ReactNode }) {
  const me = await currentUser();
  if (me?.role !== "facility_admin") return <NotAllowed need="facility admin" />;
  return children;
}
