// POST /api/pin/confirm — confirm a signature with the password (online): checked and throttled
// like a sign-in, answered with a proof that covers this one signature of this user only.
import { z } from "zod";
import { SIGNATURE_MEANINGS } from "@/lib/schemas/entry";
import { json } from "@/server/http/respond";
import { route } from "@/server/http/route";
import { passwordProof } from "@/server/signing/pin";

export const dynamic = "force-dynamic";

const schema = z.object({
  password: z.string().min(1).max(200),
  signedEntryId: z.uuid(),
  signedHash: z.string().regex(/^[0-9a-f]{64}$/),
  meaning: z.enum(SIGNATURE_MEANINGS),
});

export const POST = route(
  {
    access: "signed-in",
    surface: "signature",
    body: schema,
    maxBytes: 4_000,
    invalid: "Send the password and what is being signed.",
  },
  async ({ db, user, body: { password, ...subject } }) =>
    json({ proof: await passwordProof(db, user, password, subject) }),
);
