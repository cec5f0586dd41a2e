// People: the admin sees everyone with emails (other roles do not list users here: 403) and adds people.
import { randomUUID } from "node:crypto";
import bcrypt from "bcryptjs";
import { createUser, listUsersForAdmin } from "@/db/queries/users";
import { AppError } from "@/lib/errors";
import { newUserSchema } from "@/lib/schemas/user";
import { BCRYPT_COST } from "@/server/auth/credentials";
import { refuseWeakNewPassword } from "@/server/auth/passwords";
import { json } from "@/server/http/respond";
import { route } from "@/server/http/route";

export const dynamic = "force-dynamic";

export const GET = route({ access: ["facility_admin"], surface: "user" }, async ({ db }) =>
  json({ users: await listUsersForAdmin(db) }),
);

export const POST = route(
  { access: ["facility_admin"], surface: "user", body: newUserSchema },
  async ({ db, body: { password, ...rest } }) => {
    await refuseWeakNewPassword(password, rest);
    const passwordHash = await bcrypt.hash(password, BCRYPT_COST);
    const res = await createUser(db, { ...rest, id: `u-${randomUUID()}`, passwordHash });
    if (!res.ok) throw new AppError("conflict", "user", `Someone already uses ${rest.email}.`);
    return json({ user: res.user }, 201);
  },
);
