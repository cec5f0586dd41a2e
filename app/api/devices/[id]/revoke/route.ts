// POST /api/devices/[id]/revoke — withdraw a tablet (facility admin, reason required). Its pushes
// are refused from then on and it cannot register again; who, when and why stay in its row.
import { z } from "zod";
import { revokeDevice } from "@/db/queries/devices";
import { AppError } from "@/lib/errors";
import { deviceRevokeSchema } from "@/lib/schemas/device";
import { json } from "@/server/http/respond";
import { route } from "@/server/http/route";

export const dynamic = "force-dynamic";

export const POST = route(
  {
    access: ["facility_admin"],
    surface: "device",
    params: z.object({ id: z.string().min(1).max(100) }),
    body: deviceRevokeSchema,
    maxBytes: 2_000,
    invalid: "Say why the tablet is withdrawn.",
  },
  async ({ db, user, params: { id }, body: { reason } }) => {
    const res = await revokeDevice(db, { id, by: user.id, reason });
    if (res === "not_found") throw new AppError("not_found", "device", "No such tablet.");
    if (res === "already") throw new AppError("conflict", "device", "This tablet was already withdrawn.");
    return json({ ok: true });
  },
);
