// Chart series of one cryostat (stage temperatures, helium levels and transfers, field settings).
import { z } from "zod";
import { getCryostat } from "@/db/queries/cryostats";
import { cryostatSeries } from "@/db/queries/series";
import { AppError } from "@/lib/errors";
import { idParam } from "@/lib/schemas/ids";
import { json } from "@/server/http/respond";
import { route } from "@/server/http/route";

export const dynamic = "force-dynamic";

export const GET = route(
  { access: "signed-in", surface: "cryostat", params: z.object({ id: idParam }) },
  async ({ db, params: { id } }) => {
    const cryostat = await getCryostat(db, { id });
    if (!cryostat) throw new AppError("not_found", "cryostat", `No cryostat "${id}".`);
    return json(await cryostatSeries(db, { cryostat }));
  },
);
