// The safety officer's queue: transfers, quenches and incidents not yet audited, with flags.
import { getDb } from "@/db";
import { auditQueue } from "@/db/queries/audit";
import { ensureServerTick, keyDir } from "@/lib/audit/server-tick";
import { requireUser } from "@/lib/auth/require";
import { handle, json } from "@/lib/http/respond";

export const dynamic = "force-dynamic";

export async function GET() {
  return handle(async () => {
    await requireUser("safety_officer", "facility_admin");
    ensureServerTick();
    return json({ items: await auditQueue(await getDb(), { keyDir: keyDir() }) });
  });
}
