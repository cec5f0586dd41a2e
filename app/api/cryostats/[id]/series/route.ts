// Chart series of one cryostat (stage temperatures, helium levels and transfers, field settings).
import { getDb } from "@/db";
import { getCryostat } from "@/db/queries/cryostats";
import { cryostatSeries } from "@/db/queries/series";
import { AppError } from "@/lib/errors";
import { requireUser } from "@/server/auth/require";
import { handle, json } from "@/server/http/respond";

export const dynamic = "force-dynamic";

export async function GET(_req: Request, ctx: { params: Promise<{ id: string }> }) {
  return handle(async () => {
    await requireUser();
    const { id } = await ctx.params;
    const db = await getDb();
    const cryostat = await getCryostat(db, { id });
    if (!cryostat) throw new AppError("not_found", "cryostat", `No cryostat "${id}".`);
    return json(await cryostatSeries(db, { cryostat }));
  });
}
