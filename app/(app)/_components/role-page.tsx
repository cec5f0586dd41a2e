// The frame of a page for some roles only (facility admin, safety officer): its heading and the
// screen for those roles, or the "not allowed" notice for everyone else. A server component.
import type { ComponentType, ReactNode } from "react";
import { NotAllowed } from "@/components/shell/not-allowed";
import type { Role } from "@/lib/auth/permissions";
import { currentUser } from "@/server/auth/require";

export async function RolePage({
  roles,
  need,
  title,
  children,
}: {
  roles: readonly Role[];
  need: string;
  title: string;
  children: ReactNode;
}) {
  const me = await currentUser();
  if (!me || !roles.includes(me.role)) return <NotAllowed need={need} />;
  return (
    <>
      <h1 className="mb-4 text-3xl font-bold">{title}</h1>
      {children}
    </>
  );
}

/** A whole page (its default export) that shows one screen, with no props, to the given roles. */
export function rolePage({
  Screen,
  ...frame
}: {
  roles: readonly Role[];
  need: string;
  title: string;
  Screen: ComponentType;
}) {
  return function Page() {
    return (
      <RolePage {...frame}>
        <Screen />
      </RolePage>
    );
  };
}
