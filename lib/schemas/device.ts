// Tablet registration, shared by the tablet and the server: what a tablet sends to register
// (POST /api/devices), what it gets back, and the one rule that decides whether a pushed entry's
// device may carry it. Registration is a server act: the server issues the id and a secret, and
// binds each user who signs in on the tablet; an entry is accepted only from a registered,
// not-withdrawn device that its author has signed in on.
import { z } from "zod";
import { formatDate } from "@/lib/format";

/** What a tablet sends: the registration it holds (none on first sign-in) and its outbox size. */
export const deviceRegistrationSchema = z.object({
  deviceId: z.string().min(1).max(100).optional(),
  deviceSecret: z.string().min(1).max(200).optional(),
  pending: z.number().int().min(0).max(10_000_000).optional(),
});
export type DeviceRegistration = z.infer<typeof deviceRegistrationSchema>;

/** The answer: the id to stamp entries with, and a secret when one was just issued (keep it). */
export type DeviceRegistered = { deviceId: string; deviceSecret?: string };

/** Why the admin withdraws a tablet (required). */
export const deviceRevokeSchema = z.object({
  reason: z.string().trim().min(3, "Say why the tablet is withdrawn.").max(500),
});

/** A registered tablet as the facility admin sees it (GET /api/devices). */
export type DeviceView = {
  id: string;
  firstSeenAt: string;
  lastSeenAt: string;
  pendingCount: number | null;
  pendingAt: string | null;
  /** False for an id from before registration that nobody has adopted yet. */
  registered: boolean;
  users: { id: string; name: string; lastSignedInAt: string }[];
  revoked: { at: string; by: string | null; byName: string | null; reason: string | null } | null;
};

/** Codes of a refused registration (the tablet acts on them) and of a refused entry. */
export const DEVICE_CODES = {
  /** Registration: the tablet was withdrawn. Stop pushing, keep everything, tell the user. */
  withdrawn: "forbidden:device",
  /** Registration: the server does not know this id or the secret does not match: register afresh. */
  unknown: "conflict:device",
  /** Entry: its device id was never registered. */
  entryUnknown: "forbidden:device_unknown",
  /** Entry: its author has not signed in online on that device. */
  entryUser: "forbidden:device_user",
  /** Entry: its device was withdrawn. */
  entryWithdrawn: "forbidden:device",
} as const;

/** The plain words for a withdrawn tablet, with when it happened. */
export function withdrawnMessage(revokedAt: Date | string): string {
  const at = formatDate(typeof revokedAt === "string" ? revokedAt : revokedAt.toISOString());
  return `This tablet was withdrawn by the facility admin on ${at}. Your unsent entries are kept on it and nothing is deleted, but the server accepts nothing more from it. Ask the facility admin what to do with them, and record on another tablet meanwhile.`;
}

export const UNKNOWN_DEVICE_MESSAGE =
  "The server does not recognise this tablet's registration. It registers afresh when it is online and you are signed in.";

/** What the server knows of a device an entry names: withdrawn or not, and who signed in on it. */
export type DeviceStanding = { revokedAt: Date | null; userIds: ReadonlySet<string> };

/**
 * Why an entry may not come from the device it names, or null when it may: the device must be
 * registered, not withdrawn, and its author must have signed in on it online.
 */
export function deviceRefusal(
  entry: { deviceId: string; authorId: string },
  device: DeviceStanding | undefined,
): { code: string; message: string } | null {
  if (!device)
    return {
      code: DEVICE_CODES.entryUnknown,
      message:
        "Refused: this entry names a tablet the server has never registered. Sign in on a registered tablet while online and record it again there.",
    };
  if (device.revokedAt) return { code: DEVICE_CODES.entryWithdrawn, message: withdrawnMessage(device.revokedAt) };
  if (!device.userIds.has(entry.authorId))
    return {
      code: DEVICE_CODES.entryUser,
      message:
        "Refused: its author has not signed in on this tablet while online, so the server cannot tell it came from them. Sign in on the tablet while online and sync again.",
    };
  return null;
}
