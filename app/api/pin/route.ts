import { randomBytes } from "node:crypto";
import { z } from "zod";
import { getDb } from "@/db";
import { setPinRecord, signingSecrets } from "@/db/queries/runs";
import { AppError } from "@/lib/errors";
import {
  derivePinKey,
  formatPinRecord,
  PIN_ITERATIONS,
  PIN_LIFETIME_MS,
  PIN_PATTERN,
  parsePinRecord,
  verifierOf,
} from "@/lib/signing/proof";
import { SignInError, verifySignIn } from "@/server/auth/credentials";
import { requireUser } from "@/server/auth/require";
import { handle, json, readJson } from "@/server/http/respond";

export const dynamic = "force-dynamic";

/** What the tablet caches: enough to recognise the PIN, never enough to make a proof. */
function verifierFor(record: string | null) {
  const pin = parsePinRecord(record);
  if (!pin) return null;
  return {
    saltB64: pin.saltB64,
    iterations: pin.iterations,
    verifier: verifierOf(pin.keyHex),
    expiresAt: new Date(Date.now() + PIN_LIFETIME_MS).toISOString(),
  };
}

/** Refresh the tablet's cached PIN verifier (online, signed in): a new expiry, same PIN. */
export async function GET() {
  return handle(async () => {
    const user = await requireUser();
    const secrets = await signingSecrets(await getDb(), { userId: user.id });
    return json({ pin: verifierFor(secrets?.pinHash ?? null) });
  });
}

const setSchema = z.object({
  password: z.string().min(1).max(200),
  pin: z.string().regex(PIN_PATTERN, "6 to 12 digits"),
});

/** Set or change the signing PIN; needs the password again, so an unattended session cannot. */
export async function POST(req: Request) {
  return handle(async () => {
    const user = await requireUser();
    const body = setSchema.safeParse(await readJson(req, 2_000));
    if (!body.success) throw new AppError("bad_request", "pin", "The PIN is 6 to 12 digits.");
    if (
      /^(\d)\1+$/.test(body.data.pin) ||
      "01234567890123456789".includes(body.data.pin) ||
      "98765432109876543210".includes(body.data.pin)
    ) {
      throw new AppError("bad_request", "pin", "Choose a PIN that is not one repeated digit or a run of digits.");
    }
    const db = await getDb();
    try {
      await verifySignIn(db, { email: user.email, password: body.data.password });
    } catch (e) {
      if (e instanceof SignInError) throw new AppError("forbidden", "pin", "The password did not match.");
      throw e;
    }
    const salt = randomBytes(16).toString("base64");
    const record = formatPinRecord(PIN_ITERATIONS, salt, await derivePinKey(body.data.pin, salt, PIN_ITERATIONS));
    await setPinRecord(db, { userId: user.id, record });
    return json({ pin: verifierFor(record) });
  });
}
