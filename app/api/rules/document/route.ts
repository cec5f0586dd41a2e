// The facility's rules document. GET: the PDF in force, for anyone signed in (a download, like every
// stored file). POST (facility admin): upload a new one — checked by its first bytes and size with
// a clear message — stored, and put in force as an audited rules change (server/safety/rules-document.ts).
import { downloadResponse } from "@/server/http/download";
import { json } from "@/server/http/respond";
import { route } from "@/server/http/route";
import { putRulesDocumentInForce, rulesDocumentInForce } from "@/server/safety/rules-document";

export const dynamic = "force-dynamic";

export const POST = route(
  { access: ["facility_admin"], surface: "rules_document", body: "bytes" },
  async ({ req, db, user }) => json({ rules: await putRulesDocumentInForce(db, user, req) }, 201),
);

export const GET = route({ access: "signed-in", surface: "rules_document" }, async ({ db }) => {
  const { fileName, bytes } = await rulesDocumentInForce(db);
  return downloadResponse(bytes, { type: "application/pdf", fileName, sandbox: true });
});
