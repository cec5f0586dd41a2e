// The table of all transfers (or quenches/incidents) with filters and sorting.
import { auditTable } from "@/db/queries/audit";
import { filterFromUrl } from "@/lib/audit/filter-params";
import { checkpointKeys } from "@/server/audit/keys";
import { json } from "@/server/http/respond";
import { route } from "@/server/http/route";

export const dynamic = "force-dynamic";

export const GET = route({ access: ["safety_officer", "facility_admin"], surface: "audit" }, async ({ req, db }) =>
  json({ items: await auditTable(db, { ...filterFromUrl(req.url, "audit"), keys: checkpointKeys() }) }),
);
