// The safety officer's queue: transfers, quenches and incidents not yet audited, with flags.
import { getDb } from "@/db";
import { auditQueue } from "@/db/queries/audit";
import { checkpointKeys } from "@/server/audit/keys";
import { requireUser } from "@/server/auth/require";
import { handle, json } from "@/server/http/respond";
import { ensureServerTick } from "@/server/tick";

export const dynamic = "force-dynamic";

export async function GET() {
  return handle(async () => {
    await requireUser("safety_officer", "facility_admin");
    ensureServerTick();
    return json({ items: await auditQueue(await getDb(), { keys: checkpointKeys() }) });
  });
}
