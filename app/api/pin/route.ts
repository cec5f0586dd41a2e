// The signing PIN: GET refreshes the tablet's cached verifier (a new expiry, same PIN); POST sets
// or changes the PIN, with the password again (server/signing/pin.ts).
import { z } from "zod";
import { PIN_FORMAT_PROBLEM } from "@/lib/signing/pin-rules";
import { PIN_PATTERN } from "@/lib/signing/proof";
import { json } from "@/server/http/respond";
import { route } from "@/server/http/route";
import { currentPinVerifier, setPin } from "@/server/signing/pin";

export const dynamic = "force-dynamic";

export const GET = route({ access: "signed-in", surface: "pin" }, async ({ db, user }) =>
  json({ pin: await currentPinVerifier(db, user) }),
);

const setSchema = z.object({
  password: z.string().min(1).max(200),
  pin: z.string().regex(PIN_PATTERN, PIN_FORMAT_PROBLEM),
});

export const POST = route(
  { access: "signed-in", surface: "pin", body: setSchema, maxBytes: 2_000, invalid: PIN_FORMAT_PROBLEM },
  async ({ db, user, body }) => json({ pin: await setPin(db, user, body) }),
);
