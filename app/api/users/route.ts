import { randomUUID } from "node:crypto";
import bcrypt from "bcryptjs";
import { getDb } from "@/db";
import { createUser, listUsersForAdmin } from "@/db/queries/users";
import { AppError } from "@/lib/errors";
import { formatIssues } from "@/lib/schemas/entry";
import { newUserSchema } from "@/lib/schemas/user";
import { requireUser } from "@/server/auth/require";
import { handle, json, readJson } from "@/server/http/respond";

export const dynamic = "force-dynamic";

/** The admin sees everyone with emails; other roles do not list users here (403). */
export async function GET() {
  return handle(async () => {
    await requireUser("facility_admin");
    return json({ users: await listUsersForAdmin(await getDb()) });
  });
}

export async function POST(req: Request) {
  return handle(async () => {
    await requireUser("facility_admin");
    const parsed = newUserSchema.safeParse(await readJson(req));
    if (!parsed.success)
      throw new AppError("bad_request", "user", "Check the highlighted fields.", formatIssues(parsed.error));
    const { password, ...rest } = parsed.data;
    const res = await createUser(await getDb(), {
      ...rest,
      id: `u-${randomUUID()}`,
      passwordHash: await bcrypt.hash(password, 10),
    });
    if (!res.ok) throw new AppError("conflict", "user", `Someone already uses ${rest.email}.`);
    return json({ user: res.user }, 201);
  });
}
