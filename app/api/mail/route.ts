// The admin's read-only view of the mail outbox (with the local fake transport, the stored copy
// is the message). GET runs the mail checks and delivery first so the list is current.
import { getDb } from "@/db";
import { listMail, mailTick } from "@/db/queries/mail";
import { env } from "@/lib/env";
import { requireUser } from "@/server/auth/require";
import { handle, json } from "@/server/http/respond";
import { mailTransport } from "@/server/mail/transport";
import { ensureServerTick } from "@/server/tick";

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
