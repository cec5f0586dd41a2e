// Tablet registration, a server act: the tablet asks after an online sign-in and at the start of
// each sync round (POST /api/devices). No id: a new id and secret are issued and the signed-in
// user is bound. A known id with its secret: the user is bound (again) and the device marked
// seen. An id from before registration (a row made by its first push, no secret yet) is adopted
// once by the user who pushed under it. A withdrawn id is refused (403); an unknown id or a
// wrong secret is answered 409, and the tablet then registers afresh with a new id — so an
// invented id never gets a tablet's entries accepted, and a withdrawn id stays withdrawn.
import "server-only";
import { createHash, randomBytes, randomUUID, timingSafeEqual } from "node:crypto";
import type { Db } from "@/db/client";
import { bindDeviceUser, createDevice, getDevice } from "@/db/queries/devices";
import { AppError } from "@/lib/errors";
import {
  type DeviceRegistered,
  type DeviceRegistration,
  UNKNOWN_DEVICE_MESSAGE,
  withdrawnMessage,
} from "@/lib/schemas/device";
import type { SessionUser } from "@/lib/schemas/user";

export function hashDeviceSecret(secret: string): string {
  return createHash("sha256").update(secret, "utf8").digest("hex");
}

function sameHash(a: string, b: string): boolean {
  const x = Buffer.from(a, "hex");
  const y = Buffer.from(b, "hex");
  return x.length === y.length && timingSafeEqual(x, y);
}

const newSecret = () => randomBytes(32).toString("base64url");
const unknown = () => new AppError("conflict", "device", UNKNOWN_DEVICE_MESSAGE);

export async function registerDevice(db: Db, user: SessionUser, body: DeviceRegistration): Promise<DeviceRegistered> {
  const { deviceId, deviceSecret, pending } = body;
  if (!deviceId) {
    const id = `tab-${randomUUID()}`;
    const secret = newSecret();
    await createDevice(db, { id, secretHash: hashDeviceSecret(secret), userId: user.id, pending });
    return { deviceId: id, deviceSecret: secret };
  }
  const device = await getDevice(db, deviceId);
  if (!device) throw unknown();
  if (device.revokedAt) throw new AppError("forbidden", "device", withdrawnMessage(device.revokedAt));
  if (device.secretHash === null) {
    // Made by pushes before registration: only the user who pushed under it may adopt it, once.
    if (device.userId !== user.id) throw unknown();
    const secret = newSecret();
    const adopted = await bindDeviceUser(db, {
      id: deviceId,
      userId: user.id,
      pending,
      adoptSecretHash: hashDeviceSecret(secret),
    });
    if (!adopted) throw unknown();
    return { deviceId, deviceSecret: secret };
  }
  if (!deviceSecret || !sameHash(hashDeviceSecret(deviceSecret), device.secretHash)) throw unknown();
  await bindDeviceUser(db, { id: deviceId, userId: user.id, pending });
  return { deviceId };
}
