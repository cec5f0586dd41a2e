// The admin's read-only view of the mail outbox (with the local fake transport, the stored copy
// is the message). GET runs the mail checks and delivery first so the list is current.
import { getDb } from "@/db";
import { listMail, mailTick } from "@/db/queries/mail";
import { ensureServerTick } from "@/lib/audit/server-tick";
import { requireUser } from "@/lib/auth/require";
import { env } from "@/lib/env";
import { handle, json } from "@/lib/http/respond";
import { mailTransport } from "@/lib/mail/transport";

export const dynamic = "force-dynamic";

export async function GET() {
  return handle(async () => {
    await requireUser("facility_admin");
    ensureServerTick();
    const db = await getDb();
    await mailTick(db, mailTransport());
    return json({ transport: env().RIMELOG_MAIL, messages: await listMail(db) });
  });
}
