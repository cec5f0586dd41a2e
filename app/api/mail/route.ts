// The admin's read-only view of the mail outbox (with the local fake transport, the stored copy
// is the message). GET runs the mail checks and delivery first so the list is current.
import { listMail, mailTick } from "@/db/queries/mail";
import { env } from "@/lib/env";
import { json } from "@/server/http/respond";
import { route } from "@/server/http/route";
import { mailTransport } from "@/server/mail/transport";
import { ensureServerTick } from "@/server/tick";

export const dynamic = "force-dynamic";

export const GET = route({ access: ["facility_admin"], surface: "mail" }, async ({ db }) => {
  ensureServerTick();
  await mailTick(db, mailTransport());
  return json({ transport: env().RIMELOG_MAIL, messages: await listMail(db) });
});
