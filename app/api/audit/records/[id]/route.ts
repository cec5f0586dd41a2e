// One audited record with its signatures, findings, flags and figures.
import { z } from "zod";
import { auditRecord } from "@/db/queries/audit";
import { AppError } from "@/lib/errors";
import { uuidParam } from "@/lib/schemas/ids";
import { checkpointKeys } from "@/server/audit/keys";
import { json } from "@/server/http/respond";
import { route } from "@/server/http/route";

export const dynamic = "force-dynamic";

export const GET = route(
  {
    access: ["safety_officer", "facility_admin"],
    surface: "audit",
    params: z.object({ id: uuidParam }),
    invalid: "That is not a record id.",
  },
  async ({ db, params }) => {
    const item = await auditRecord(db, { id: params.id, keys: checkpointKeys() });
    if (!item) throw new AppError("not_found", "audit", "No transfer, quench or incident with that id.");
    return json({ item });
  },
);
