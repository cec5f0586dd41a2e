// Photos and files waiting on the tablet go up before the entries that name them are pushed.
import type { RimelogDexie } from "@/lib/local/db";
import { type Transport, TransportError } from "./transport";

/** Upload this user's waiting attachments, one after another; returns how many went up. */
export async function uploadAttachments(
  db: RimelogDexie,
  transport: Transport,
  userId: string,
  now: () => Date,
): Promise<number> {
  if (!transport.upload) return 0;
  const waiting = (await db.attachments.where("state").equals("pending").toArray()).filter(
    (a) => a.authorId === userId,
  );
  let n = 0;
  for (const a of waiting) {
    try {
      await transport.upload(a);
      await db.attachments.update(a.id, { state: "uploaded", rejection: null });
      n += 1;
    } catch (e) {
      // A file the server refuses (type, size) is marked and kept; anything else stops this round.
      if (
        e instanceof TransportError &&
        (e.kind === "bad_request" || e.kind === "too_large" || e.kind === "forbidden")
      ) {
        await db.attachments.update(a.id, {
          state: "rejected",
          rejection: { code: e.code ?? e.kind, message: e.message, at: now().toISOString() },
        });
      } else throw e;
    }
  }
  return n;
}
