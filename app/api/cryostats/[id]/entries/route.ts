// One cryostat's log, newest first, a page at a time (filtered to what the role may read).
import { z } from "zod";
import { getCryostat } from "@/db/queries/cryostats";
import { listCryostatEntries } from "@/db/queries/entries";
import { AppError } from "@/lib/errors";
import { idParam } from "@/lib/schemas/ids";
import { json } from "@/server/http/respond";
import { route } from "@/server/http/route";

export const dynamic = "force-dynamic";

const query = z.object({
  cursor: z.coerce.number().int().positive().optional(),
  limit: z.coerce.number().int().min(1).max(100).default(30),
});

export const GET = route(
  {
    access: "signed-in",
    surface: "cryostat",
    params: z.object({ id: idParam }),
    query,
    invalid: { surface: "cursor", message: "The page cursor must be a positive whole number." },
  },
  async ({ db, user, params: { id }, query: q }) => {
    if (!(await getCryostat(db, { id }))) throw new AppError("not_found", "cryostat", `No cryostat "${id}".`);
    return json(await listCryostatEntries(db, { cryostatId: id, role: user.role, ...q }));
  },
);
