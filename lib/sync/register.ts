// The tablet's registration with the server (lib/schemas/device.ts): after an online sign-in and
// at the start of each sync round it sends the registration it holds (none the first time) and
// its outbox size. The server binds the signed-in user, or issues a new id and secret (kept in
// the store's meta), or answers that the tablet was withdrawn: then the store remembers it, the
// round pushes nothing and the screen says what to do. Nothing is ever deleted here.
import type { RimelogDexie } from "@/lib/local/db";
import { DEVICE_CODES, type DeviceRegistered } from "@/lib/schemas/device";
import { type Transport, TransportError } from "./transport";

export type Registration = "registered" | "withdrawn" | "no_register";

async function keep(db: RimelogDexie, reply: DeviceRegistered): Promise<void> {
  await db.transaction("rw", db.meta, async () => {
    await db.setMeta("deviceId", reply.deviceId);
    if (reply.deviceSecret) await db.setMeta("deviceSecret", reply.deviceSecret);
    await db.setMeta("deviceWithdrawn", null);
  });
}

const isCode = (e: unknown, code: string) => e instanceof TransportError && e.code === code;

/**
 * Register (or re-confirm) this tablet for whoever is signed in on the server. Throws the
 * transport's error when the server cannot be reached (the round fails and is retried).
 */
export async function registerDevice(
  db: RimelogDexie,
  transport: Pick<Transport, "register">,
  now: () => Date = () => new Date(),
): Promise<Registration> {
  if (!transport.register) return "no_register";
  const [deviceId, deviceSecret] = await db.getMetas("deviceId", "deviceSecret");
  const pending = await db.outbox.count();
  try {
    await keep(db, await transport.register({ deviceId, deviceSecret, pending }));
    return "registered";
  } catch (e) {
    if (isCode(e, DEVICE_CODES.withdrawn)) {
      const message = (e as TransportError).message;
      await db.setMeta("deviceWithdrawn", { message, at: now().toISOString() });
      return "withdrawn";
    }
    if (!isCode(e, DEVICE_CODES.unknown)) throw e;
  }
  // The server does not know the registration held here: a fresh one (a new id). Entries already
  // written carry the old id and stay as the server answers them; they are never re-stamped.
  await keep(db, await transport.register({ pending }));
  return "registered";
}
