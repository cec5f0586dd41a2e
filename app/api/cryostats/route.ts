import { getDb } from "@/db";
import { roomOverview } from "@/db/queries/cryostats";
import { requireUser } from "@/server/auth/require";
import { handle, json } from "@/server/http/respond";

export const dynamic = "force-dynamic";

export async function GET() {
  return handle(async () => {
    await requireUser();
    return json({ cryostats: await roomOverview(await getDb()) });
  });
}
