import { z } from "zod";
import { getDb } from "@/db";
import { getCryostat } from "@/db/queries/cryostats";
import { listCryostatEntries } from "@/db/queries/entries";
import { AppError } from "@/lib/errors";
import { requireUser } from "@/server/auth/require";
import { handle, json } from "@/server/http/respond";

export const dynamic = "force-dynamic";

const query = z.object({
  cursor: z.coerce.number().int().positive().optional(),
  limit: z.coerce.number().int().min(1).max(100).default(30),
});

export async function GET(req: Request, ctx: { params: Promise<{ id: string }> }) {
  return handle(async () => {
    const user = await requireUser();
    const { id } = await ctx.params;
    const q = query.safeParse(Object.fromEntries(new URL(req.url).searchParams));
    if (!q.success) throw new AppError("bad_request", "cursor", "The page cursor must be a positive whole number.");
    const db = await getDb();
    if (!(await getCryostat(db, { id }))) throw new AppError("not_found", "cryostat", `No cryostat "${id}".`);
    return json(await listCryostatEntries(db, { cryostatId: id, role: user.role, ...q.data }));
  });
}
