// The safety officer's queue: transfers, quenches and incidents not yet audited, with flags.
import { auditQueue } from "@/db/queries/audit";
import { checkpointKeys } from "@/server/audit/keys";
import { json } from "@/server/http/respond";
import { route } from "@/server/http/route";
import { ensureServerTick } from "@/server/tick";

export const dynamic = "force-dynamic";

export const GET = route({ access: ["safety_officer", "facility_admin"], surface: "audit" }, async ({ db }) => {
  ensureServerTick();
  return json({ items: await auditQueue(db, { keys: checkpointKeys() }) });
});
