// One audited record with its signatures, findings, flags and figures.
import { getDb } from "@/db";
import { auditRecord } from "@/db/queries/audit";
import { AppError } from "@/lib/errors";
import { checkpointKeys } from "@/server/audit/keys";
import { requireUser } from "@/server/auth/require";
import { handle, json } from "@/server/http/respond";

export const dynamic = "force-dynamic";

export async function GET(_req: Request, { params }: { params: Promise<{ id: string }> }) {
  return handle(async () => {
    await requireUser("safety_officer", "facility_admin");
    const { id } = await params;
    if (!/^[0-9a-f-]{36}$/i.test(id)) throw new AppError("bad_request", "audit", "That is not a record id.");
    const item = await auditRecord(await getDb(), { id, keys: checkpointKeys() });
    if (!item) throw new AppError("not_found", "audit", "No transfer, quench or incident with that id.");
    return json({ item });
  });
}
