// End every session a person holds (facility admin): each copy of their cookie is signed out at
// its next request; they sign in again with their password.
import { z } from "zod";
import { getUser } from "@/db/queries/users";
import { AppError } from "@/lib/errors";
import { idParam } from "@/lib/schemas/ids";
import { closeUserSessions } from "@/server/auth/sessions";
import { json } from "@/server/http/respond";
import { route } from "@/server/http/route";

export const dynamic = "force-dynamic";

export const POST = route(
  {
    access: ["facility_admin"],
    surface: "user",
    params: z.object({ id: idParam }),
    body: z.object({}),
    maxBytes: 1_000,
  },
  async ({ db, params: { id } }) => {
    if (!(await getUser(db, { id }))) throw new AppError("not_found", "user", "No such person.");
    return json({ ended: await closeUserSessions(db, id, "admin") });
  },
);
