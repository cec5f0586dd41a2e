// Changing passwords: your own (with the current one, checked and limited like a sign-in), and
// the facility admin's reset, which makes the person choose a new one at their next sign-in. New
// passwords follow the policy (./password-policy.ts) and are hashed with bcrypt at BCRYPT_COST.
import "server-only";
import bcrypt from "bcryptjs";
import type { Db } from "@/db/client";
import { getUser, setPassword } from "@/db/queries/users";
import { AppError } from "@/lib/errors";
import type { SessionUser } from "@/lib/schemas/user";
import { BCRYPT_COST, SignInError, SignInLimited, verifySignIn } from "./credentials";
import { passwordProblem } from "./password-policy";
import { closeUserSessions } from "./sessions";

async function refuseWeak(password: string, person: { email: string; name: string }, field: string) {
  const problem = await passwordProblem(password, person);
  if (problem)
    throw new AppError(
      "bad_request",
      "password",
      problem,
      [`${field}: ${problem}`],
      [{ path: field, message: problem }],
    );
}

/** Change your own password; your other sessions end, this one goes on (and no longer must change). */
export async function changeOwnPassword(
  db: Db,
  me: SessionUser,
  sessionId: string,
  input: { currentPassword: string; newPassword: string },
): Promise<void> {
  try {
    await verifySignIn(db, { email: me.email, password: input.currentPassword });
  } catch (e) {
    if (e instanceof SignInLimited) throw new AppError("rate_limited", "password", e.message);
    if (e instanceof SignInError) {
      const m = "The current password did not match.";
      throw new AppError(
        "forbidden",
        "password",
        m,
        [`currentPassword: ${m}`],
        [{ path: "currentPassword", message: m }],
      );
    }
    throw e;
  }
  if (input.newPassword === input.currentPassword) {
    const m = "Choose a password different from the current one.";
    throw new AppError("bad_request", "password", m, [`newPassword: ${m}`], [{ path: "newPassword", message: m }]);
  }
  await refuseWeak(input.newPassword, me, "newPassword");
  const passwordHash = await bcrypt.hash(input.newPassword, BCRYPT_COST);
  await setPassword(db, { id: me.id, passwordHash, mustChange: false, now: new Date() });
  await closeUserSessions(db, me.id, "password", sessionId);
}

/** An admin sets a first password for someone; every session of theirs ends; they must change it. */
export async function resetPassword(db: Db, admin: SessionUser, input: { id: string; password: string }) {
  if (input.id === admin.id) throw new AppError("forbidden", "password", "Change your own password under My account.");
  const person = await getUser(db, { id: input.id });
  if (!person) throw new AppError("not_found", "user", "No such person.");
  await refuseWeak(input.password, person, "password");
  const passwordHash = await bcrypt.hash(input.password, BCRYPT_COST);
  await setPassword(db, { id: person.id, passwordHash, mustChange: true, now: new Date() });
  return { ended: await closeUserSessions(db, person.id, "password") };
}

/** The policy for a new person's first password (POST /api/users). */
export async function refuseWeakNewPassword(password: string, person: { email: string; name: string }) {
  await refuseWeak(password, person, "password");
}
