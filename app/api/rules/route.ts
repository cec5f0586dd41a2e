// The facility rules: anyone signed in reads them (cautions show them on every work screen);
// only the facility admin changes them, and each change is an audited log entry.
import { getDb } from "@/db";
import { changeRules, getRules } from "@/db/queries/rules";
import { AppError } from "@/lib/errors";
import { rulesChangeInputSchema } from "@/lib/safety/rules-input";
import { formatIssues } from "@/lib/schemas/entry";
import { requireUser } from "@/server/auth/require";
import { handle, json, readJson } from "@/server/http/respond";

export const dynamic = "force-dynamic";

export async function GET() {
  return handle(async () => {
    await requireUser();
    return json({ rules: await getRules(await getDb()) });
  });
}

export async function PUT(req: Request) {
  return handle(async () => {
    const user = await requireUser("facility_admin");
    const parsed = rulesChangeInputSchema.safeParse(await readJson(req, 200_000));
    if (!parsed.success)
      throw new AppError("bad_request", "rules", "Check the highlighted fields.", formatIssues(parsed.error));
    return json({ rules: await changeRules(await getDb(), user, parsed.data) });
  });
}
