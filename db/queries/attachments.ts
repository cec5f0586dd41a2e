// Attachment records (photos, the rules PDF, calibration files): one row per uploaded file,
// idempotent by the id the tablet made, pointing at the object store by a server-made key.
import { eq } from "drizzle-orm";
import type { Db } from "@/db/client";
import { type Attachment, attachments } from "@/db/schema";

export type NewAttachment = {
  id: string;
  fileName: string;
  mime: string;
  bytes: number;
  sha256: string;
  storageKey: string;
  uploadedBy: string;
};

export async function getAttachment(db: Db, { id }: { id: string }): Promise<Attachment | undefined> {
  const [row] = await db.select().from(attachments).where(eq(attachments.id, id));
  return row;
}

/** Insert once; the same id again answers with the stored row (the caller compares content). */
export async function saveAttachment(db: Db, a: NewAttachment): Promise<{ row: Attachment; created: boolean }> {
  const [row] = await db.insert(attachments).values(a).onConflictDoNothing({ target: attachments.id }).returning();
  if (row) return { row, created: true };
  const existing = await getAttachment(db, { id: a.id });
  if (!existing) throw new Error("attachment vanished after a conflicting insert");
  return { row: existing, created: false };
}
