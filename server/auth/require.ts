// The one session check every route handler and server component makes first:
// 401 when not signed in (or the session ended or expired), 403 when the role may not, and 403
// while the person must change their password (an admin reset), except where the change is made.
import "server-only";
import { getServerSession } from "next-auth";
import { cache } from "react";
import { getDb } from "@/db";
import { AppError } from "@/lib/errors";
import type { Role, SessionUser } from "@/lib/schemas/user";
import { authOptions } from "./options";
import { type LiveSession, liveSession } from "./sessions";

export const MUST_CHANGE_PASSWORD =
  "Your password was reset: choose a new one first (My account, or /account) before anything else.";

/** The live server-side session of this request, looked up once; null when signed out, ended or expired. */
export const currentSession = cache(async (): Promise<LiveSession | null> => {
  const session = await getServerSession(authOptions);
  if (!session?.user?.id) return null;
  const live = await liveSession(await getDb(), { id: session.sid, sessionVersion: session.sv });
  return live && live.user.id === session.user.id ? live : null;
});

/** The signed-in user, looked up once per request; null when there is none or it was ended. */
export async function currentUser(): Promise<SessionUser | null> {
  return (await currentSession())?.user ?? null;
}

export type RequireOptions = {
  roles?: readonly Role[];
  /** Allowed while the person must still change their password (the change itself, who am I). */
  duringPasswordChange?: boolean;
};

export async function requireSession({ roles = [], duringPasswordChange = false }: RequireOptions = {}) {
  const live = await currentSession();
  if (!live) throw new AppError("unauthorized", "session", "Sign in first.");
  if (live.mustChangePassword && !duringPasswordChange)
    throw new AppError("forbidden", "password", MUST_CHANGE_PASSWORD);
  if (roles.length && !roles.includes(live.user.role)) {
    throw new AppError("forbidden", "role", `This needs one of these roles: ${roles.join(", ").replaceAll("_", " ")}.`);
  }
  return live;
}

export async function requireUser(...roles: Role[]): Promise<SessionUser> {
  return (await requireSession({ roles })).user;
}
