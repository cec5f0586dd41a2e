// Procedure templates: every version of every template (any signed-in user: the tablet caches
// them); POST saves a template as the next version of its key (facility admin).
import { z } from "zod";
import { listTemplates, saveTemplateVersion } from "@/db/queries/templates";
import { AppError } from "@/lib/errors";
import { templateInputSchema } from "@/lib/schemas/run";
import { json } from "@/server/http/respond";
import { parseInput, route } from "@/server/http/route";

export const dynamic = "force-dynamic";

export const GET = route({ access: "signed-in", surface: "template" }, async ({ db }) =>
  json({ templates: await listTemplates(db) }),
);

const saveSchema = z.object({ basedOnVersion: z.number().int().positive().nullable(), template: z.unknown() });

export const POST = route(
  {
    access: ["facility_admin"],
    surface: "template",
    body: saveSchema,
    maxBytes: 300_000,
    invalid: "Send { basedOnVersion, template }.",
  },
  async ({ db, user, body }) => {
    const input = parseInput(templateInputSchema, body.template, { surface: "template" });
    const res = await saveTemplateVersion(db, { input, createdBy: user.id, basedOnVersion: body.basedOnVersion });
    if (!res.ok)
      throw new AppError(
        "conflict",
        "template",
        `Someone saved version ${res.latest} of this procedure while you were editing. Reload it and make your change again.`,
      );
    return json({ template: res.template }, 201);
  },
);
