import { z } from "zod";
import { getDb } from "@/db";
import { changeUserAccess } from "@/db/queries/users";
import { AppError } from "@/lib/errors";
import { formatIssues } from "@/lib/schemas/entry";
import { requireUser } from "@/server/auth/require";
import { handle, json, readJson } from "@/server/http/respond";

export const dynamic = "force-dynamic";

const body = z
  .object({
    role: z.enum(["technician", "researcher", "safety_officer", "facility_admin"]).optional(),
    active: z.boolean().optional(),
  })
  .refine((b) => b.role !== undefined || b.active !== undefined, "Say what to change: role or active.");

const REASONS = {
  not_found: new AppError("not_found", "user", "No such person."),
  self: new AppError("forbidden", "user", "You cannot change your own role or access; ask another facility admin."),
  no_change: new AppError("bad_request", "user", "Nothing to change: the person already has that role and access."),
};

/** Change a person's role or access (facility admin). Their open sessions end. */
export async function PATCH(req: Request, ctx: { params: Promise<{ id: string }> }) {
  return handle(async () => {
    const admin = await requireUser("facility_admin");
    const parsed = body.safeParse(await readJson(req, 10_000));
    if (!parsed.success) throw new AppError("bad_request", "user", "Check the change.", formatIssues(parsed.error));
    const { id } = await ctx.params;
    const res = await changeUserAccess(await getDb(), admin, { id, change: parsed.data, deviceId: "server" });
    if (!res.ok) throw REASONS[res.reason];
    return json({ user: res.user });
  });
}
