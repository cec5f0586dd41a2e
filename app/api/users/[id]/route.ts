// Change a person's role or access (facility admin). Their open sessions end.
import { z } from "zod";
import { changeUserAccess } from "@/db/queries/users";
import { AppError } from "@/lib/errors";
import { idParam } from "@/lib/schemas/ids";
import { ROLES } from "@/lib/schemas/user";
import { json } from "@/server/http/respond";
import { route } from "@/server/http/route";

export const dynamic = "force-dynamic";

const body = z
  .object({ role: z.enum(ROLES).optional(), active: z.boolean().optional() })
  .refine((b) => b.role !== undefined || b.active !== undefined, "Say what to change: role or active.");

const REASONS = {
  not_found: () => new AppError("not_found", "user", "No such person."),
  self: () =>
    new AppError("forbidden", "user", "You cannot change your own role or access; ask another facility admin."),
  no_change: () =>
    new AppError("bad_request", "user", "Nothing to change: the person already has that role and access."),
};

export const PATCH = route(
  {
    access: ["facility_admin"],
    surface: "user",
    params: z.object({ id: idParam }),
    body,
    maxBytes: 10_000,
    invalid: "Check the change.",
  },
  async ({ db, user, params: { id }, body: change }) => {
    const res = await changeUserAccess(db, user, { id, change, deviceId: "server" });
    if (!res.ok) throw REASONS[res.reason]();
    return json({ user: res.user });
  },
);
