// Facility rules: the version in force (newest row), its history, and changing them. A change is
// written as a `rules.change` entry on the facility chain (so it is hash-chained and audited like
// every other record, with old and new values) and the new version row in the same transaction.
import "server-only";
import { randomUUID } from "node:crypto";
import { desc, eq } from "drizzle-orm";
import type { Db } from "@/db/client";
import { attachments, facilityRules, users } from "@/db/schema";
import { AppError } from "@/lib/errors";
import { diffRules } from "@/lib/safety/rules-diff";
import {
  type FacilityRulesValues,
  facilityRulesValuesSchema,
  type RulesDocument,
  type RulesInForce,
} from "@/lib/schemas/rules";
import type { SessionUser } from "@/lib/schemas/user";
import { appendEntries } from "./entries";

export type { RulesDocument, RulesInForce };

export async function getRules(db: Db): Promise<RulesInForce | null> {
  const [row] = await db
    .select({ r: facilityRules, name: users.name })
    .from(facilityRules)
    .leftJoin(users, eq(users.id, facilityRules.changedBy))
    .orderBy(desc(facilityRules.version))
    .limit(1);
  if (!row) return null;
  let document: RulesDocument | null = null;
  if (row.r.documentAttachmentId) {
    const [a] = await db.select().from(attachments).where(eq(attachments.id, row.r.documentAttachmentId));
    if (a)
      document = {
        id: a.id,
        fileName: a.fileName,
        bytes: a.bytes,
        sha256: a.sha256,
        uploadedAt: a.createdAt.toISOString(),
      };
  }
  return {
    version: row.r.version,
    values: row.r.values,
    document,
    changedBy: row.r.changedBy,
    changedByName: row.name ?? row.r.changedBy,
    changedAt: row.r.changedAt.toISOString(),
  };
}

/** Values in force, or an error a screen can show when the admin has not set them yet. */
export async function requireRules(db: Db): Promise<RulesInForce> {
  const r = await getRules(db);
  if (!r) throw new AppError("not_found", "rules", "The facility admin has not set the facility rules yet.");
  return r;
}

export async function rulesHistory(db: Db) {
  return db
    .select({
      version: facilityRules.version,
      changedBy: users.name,
      changedAt: facilityRules.changedAt,
      documentAttachmentId: facilityRules.documentAttachmentId,
    })
    .from(facilityRules)
    .leftJoin(users, eq(users.id, facilityRules.changedBy))
    .orderBy(desc(facilityRules.version));
}

/**
 * Put a new version of the rules in force. `expectedVersion` guards against two admins saving
 * over each other; `documentAttachmentId: undefined` keeps the current document.
 */
export async function changeRules(
  db: Db,
  user: SessionUser,
  input: {
    values: FacilityRulesValues;
    reason: string;
    expectedVersion: number | null;
    documentAttachmentId?: string | null;
    deviceId?: string;
  },
): Promise<RulesInForce> {
  const values = facilityRulesValuesSchema.parse(input.values);
  await db.transaction(async (tx) => {
    const t = tx as unknown as Db;
    const current = await getRules(t);
    if ((current?.version ?? null) !== input.expectedVersion) {
      throw new AppError(
        "conflict",
        "rules",
        "Someone else changed the rules meanwhile. Reload to see their version, then make your change again.",
      );
    }
    const documentAttachmentId =
      input.documentAttachmentId === undefined ? (current?.document?.id ?? null) : input.documentAttachmentId;
    if (documentAttachmentId) {
      const [a] = await t
        .select({ mime: attachments.mime })
        .from(attachments)
        .where(eq(attachments.id, documentAttachmentId));
      if (!a) throw new AppError("bad_request", "rules", "The rules document was not found; upload it again.");
      if (a.mime !== "application/pdf") throw new AppError("unsupported", "rules", "The rules document must be a PDF.");
    }
    const changes = diffRules(current?.values ?? null, values);
    const documentChanged = documentAttachmentId !== (current?.document?.id ?? null);
    if (!changes.length && !documentChanged)
      throw new AppError("bad_request", "rules", "Nothing changed: the values are the same as the ones in force.");
    const version = (current?.version ?? 0) + 1;
    const res = await appendEntries(t, user, [
      {
        id: randomUUID(),
        cryostatId: null,
        runId: null,
        kind: "rules.change",
        payload: {
          version,
          reason: input.reason,
          changes,
          values,
          documentAttachmentId,
          previousDocumentAttachmentId: current?.document?.id ?? null,
        },
        authorId: user.id,
        deviceId: input.deviceId ?? "server-admin",
        recordedAt: new Date().toISOString(),
        supersedes: null,
        reason: null,
      },
    ]);
    const problem = res.rejected[0];
    if (problem) throw new AppError("forbidden", "rules", problem.message);
    await t.insert(facilityRules).values({ version, values, documentAttachmentId, changedBy: user.id });
  });
  return (await getRules(db))!;
}
