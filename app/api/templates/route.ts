import { z } from "zod";
import { getDb } from "@/db";
import { listTemplates, saveTemplateVersion } from "@/db/queries/templates";
import { AppError } from "@/lib/errors";
import { formatIssues } from "@/lib/schemas/entry";
import { templateInputSchema } from "@/lib/schemas/run";
import { requireUser } from "@/server/auth/require";
import { handle, json, readJson } from "@/server/http/respond";

export const dynamic = "force-dynamic";

/** Every version of every procedure template (any signed-in user: the tablet caches them). */
export async function GET() {
  return handle(async () => {
    await requireUser();
    return json({ templates: await listTemplates(await getDb()) });
  });
}

const saveSchema = z.object({ basedOnVersion: z.number().int().positive().nullable(), template: z.unknown() });

/** Save a template as the next version of its key (facility admin). */
export async function POST(req: Request) {
  return handle(async () => {
    const user = await requireUser("facility_admin");
    const body = saveSchema.safeParse(await readJson(req, 300_000));
    if (!body.success)
      throw new AppError("bad_request", "template", "Send { basedOnVersion, template }.", formatIssues(body.error));
    const parsed = templateInputSchema.safeParse(body.data.template);
    if (!parsed.success)
      throw new AppError("bad_request", "template", "Check the highlighted fields.", formatIssues(parsed.error));
    const res = await saveTemplateVersion(await getDb(), {
      input: parsed.data,
      createdBy: user.id,
      basedOnVersion: body.data.basedOnVersion,
    });
    if (!res.ok)
      throw new AppError(
        "conflict",
        "template",
        `Someone saved version ${res.latest} of this procedure while you were editing. Reload it and make your change again.`,
      );
    return json({ template: res.template }, 201);
  });
}
