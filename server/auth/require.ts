// The one role check every route handler and server action makes first:
// 401 when not signed in (or the session was ended), 403 when the role may not.
import "server-only";
import { getServerSession } from "next-auth";
import { cache } from "react";
import { getDb } from "@/db";
import { getUser } from "@/db/queries/users";
import { AppError } from "@/lib/errors";
import type { Role, SessionUser } from "@/lib/schemas/user";
import { authOptions } from "./options";

/** The signed-in user, looked up once per request; null when there is none or it was revoked. */
export const currentUser = cache(async (): Promise<SessionUser | null> => {
  const session = await getServerSession(authOptions);
  const id = session?.user?.id;
  if (!id) return null;
  const row = await getUser(await getDb(), { id });
  if (!row?.active || session.sv !== row.sessionVersion) return null;
  return { id: row.id, email: row.email, name: row.name, role: row.role };
});

export async function requireUser(...roles: Role[]): Promise<SessionUser> {
  const user = await currentUser();
  if (!user) throw new AppError("unauthorized", "session", "Sign in first.");
  if (roles.length && !roles.includes(user.role)) {
    throw new AppError("forbidden", "role", `This needs one of these roles: ${roles.join(", ").replaceAll("_", " ")}.`);
  }
  return user;
}
