// Reset a person's password (facility admin): a first password to hand over; every session of
// theirs ends and they must choose a new one at their next sign-in.
import { z } from "zod";
import { idParam } from "@/lib/schemas/ids";
import { resetPassword } from "@/server/auth/passwords";
import { json } from "@/server/http/respond";
import { route } from "@/server/http/route";

export const dynamic = "force-dynamic";

export const POST = route(
  {
    access: ["facility_admin"],
    surface: "password",
    params: z.object({ id: idParam }),
    body: z.object({ password: z.string().min(1, "Enter the first password.").max(200) }),
    maxBytes: 2_000,
  },
  async ({ db, user, params: { id }, body: { password } }) => json(await resetPassword(db, user, { id, password })),
);
