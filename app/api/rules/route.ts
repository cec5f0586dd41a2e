// The facility rules: anyone signed in reads them (cautions show them on every work screen);
// only the facility admin changes them, and each change is an audited log entry.
import { changeRules, getRules } from "@/db/queries/rules";
import { rulesChangeInputSchema } from "@/lib/safety/rules-input";
import { json } from "@/server/http/respond";
import { route } from "@/server/http/route";

export const dynamic = "force-dynamic";

export const GET = route({ access: "signed-in", surface: "rules" }, async ({ db }) =>
  json({ rules: await getRules(db) }),
);

export const PUT = route(
  { access: ["facility_admin"], surface: "rules", body: rulesChangeInputSchema, maxBytes: 200_000 },
  async ({ db, user, body }) => json({ rules: await changeRules(db, user, body) }),
);
