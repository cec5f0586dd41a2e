// GET /api/devices — the registered tablets (facility admin): last seen, who signed in on them,
// their unsent count when they said it, withdrawn when and by whom.
// POST /api/devices — register this tablet (any signed-in user): after an online sign-in and at
// the start of each sync round. See server/devices/register.ts.
import { listDevices } from "@/db/queries/devices";
import { deviceRegistrationSchema } from "@/lib/schemas/device";
import { registerDevice } from "@/server/devices/register";
import { json } from "@/server/http/respond";
import { route } from "@/server/http/route";

export const dynamic = "force-dynamic";

export const GET = route({ access: ["facility_admin"], surface: "device" }, async ({ db }) =>
  json({ devices: await listDevices(db) }),
);

export const POST = route(
  { access: "signed-in", surface: "device", body: deviceRegistrationSchema, maxBytes: 2_000 },
  async ({ db, user, body }) => json(await registerDevice(db, user, body)),
);
