// Sealing the tablet at sign-out: refuse while this user's entries or photos are unsent, then
// clear what this user left on the tablet (pulled data, their entries and photos). The device id
// stays: it identifies the tablet, not the person.
import type { RimelogDexie } from "./db";

export type SignOutCheck =
  | { ok: true; rejected: number }
  | { ok: false; pending: number; pendingAttachments: number; message: string };

export async function checkSignOut(db: RimelogDexie): Promise<SignOutCheck> {
  const session = await db.getMeta("session");
  const uid = session?.user.id;
  const [pending, pendingAttachments, rejected] = await Promise.all([
    uid ? db.outbox.where("authorId").equals(uid).count() : db.outbox.count(),
    db.attachments
      .where("state")
      .equals("pending")
      .filter((a) => !uid || a.authorId === uid)
      .count(),
    db.entries
      .where("sync")
      .equals("rejected")
      .filter((e) => !uid || e.authorId === uid)
      .count(),
  ]);
  if (pending > 0 || pendingAttachments > 0) {
    const what = [
      pending ? `${pending} ${pending === 1 ? "entry" : "entries"}` : "",
      pendingAttachments ? `${pendingAttachments} photo${pendingAttachments === 1 ? "" : "s"}` : "",
    ]
      .filter(Boolean)
      .join(" and ");
    return {
      ok: false,
      pending,
      pendingAttachments,
      message: `Not signed out: ${what} on this tablet ${pending + pendingAttachments === 1 ? "has" : "have"} not reached the server yet. Connect to the network and wait until the sync shows nothing pending, then sign out.`,
    };
  }
  return { ok: true, rejected };
}

/** Remove the signed-out user's data from the tablet. Other people's unsent entries stay. */
export async function clearLocalData(db: RimelogDexie): Promise<void> {
  await db.transaction(
    "rw",
    [
      db.entries,
      db.outbox,
      db.receipts,
      db.attachments,
      db.cryostats,
      db.templates,
      db.calibrations,
      db.users,
      db.meta,
    ],
    async () => {
      const waiting = new Set((await db.outbox.toArray()).map((o) => o.entryId));
      await db.entries.filter((e) => !waiting.has(e.id)).delete();
      await db.receipts.clear(); // answers for entries that were just removed
      const others = new Set((await db.outbox.toArray()).map((o) => o.authorId));
      await db.attachments.filter((a) => !(a.state === "pending" && others.has(a.authorId))).delete();
      await db.cryostats.clear();
      await db.templates.clear();
      await db.calibrations.clear();
      await db.users.clear();
      await db.meta.bulkDelete(["session", "cursor", "refHash", "rules", "lastSuccess", "lastAttempt", "lastError"]);
    },
  );
}
