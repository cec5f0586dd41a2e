// Procedure templates: immutable versions per key. Saving a template inserts the next version;
// old versions stay, so a run keeps the exact steps it started from.
import { randomUUID } from "node:crypto";
import { and, asc, desc, eq, sql } from "drizzle-orm";
import type { Db } from "@/db/client";
import { type ProcedureTemplate, procedureTemplates } from "@/db/schema";
import type { TemplateInput } from "@/lib/schemas/run";

/** Every version of every template (the tablet caches them all: old runs need their version). */
export async function listTemplates(db: Db): Promise<ProcedureTemplate[]> {
  return db.select().from(procedureTemplates).orderBy(asc(procedureTemplates.key), desc(procedureTemplates.version));
}

/** The newest version of each key. */
export async function latestTemplates(db: Db): Promise<ProcedureTemplate[]> {
  return db
    .selectDistinctOn([procedureTemplates.key])
    .from(procedureTemplates)
    .orderBy(procedureTemplates.key, desc(procedureTemplates.version));
}

export async function getTemplate(db: Db, { id }: { id: string }): Promise<ProcedureTemplate | undefined> {
  const [t] = await db.select().from(procedureTemplates).where(eq(procedureTemplates.id, id));
  return t;
}

export async function getTemplateVersion(
  db: Db,
  { key, version }: { key: string; version: number },
): Promise<ProcedureTemplate | undefined> {
  const [t] = await db
    .select()
    .from(procedureTemplates)
    .where(and(eq(procedureTemplates.key, key), eq(procedureTemplates.version, version)));
  return t;
}

/**
 * Save a template as the next version of its key. `basedOnVersion` is the version the editor
 * started from: if someone saved a newer one meanwhile, the save is refused rather than
 * silently overwriting their steps with an older copy.
 */
export async function saveTemplateVersion(
  db: Db,
  { input, createdBy, basedOnVersion }: { input: TemplateInput; createdBy: string; basedOnVersion: number | null },
): Promise<{ ok: true; template: ProcedureTemplate } | { ok: false; reason: "stale"; latest: number }> {
  return db.transaction(async (tx) => {
    const t = tx as unknown as Db;
    const [row] = await t
      .select({ v: sql<number>`coalesce(max(${procedureTemplates.version}), 0)::int` })
      .from(procedureTemplates)
      .where(eq(procedureTemplates.key, input.key));
    const latest = Number(row?.v ?? 0);
    if ((basedOnVersion ?? 0) !== latest) return { ok: false as const, reason: "stale" as const, latest };
    const [saved] = await t
      .insert(procedureTemplates)
      .values({
        id: randomUUID(),
        key: input.key,
        version: latest + 1,
        title: input.title,
        purpose: input.purpose,
        cryostatKinds: input.cryostatKinds,
        steps: input.steps,
        createdBy,
      })
      .returning();
    return { ok: true as const, template: saved! };
  });
}
