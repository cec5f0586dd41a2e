import { z } from "zod";
import { getDb } from "@/db";
import { signingSecrets } from "@/db/queries/runs";
import { AppError } from "@/lib/errors";
import { SIGNATURE_MEANINGS } from "@/lib/schemas/entry";
import { hmacHex, passwordProofKey, signingMessage } from "@/lib/signing/proof";
import { SignInError, verifySignIn } from "@/server/auth/credentials";
import { requireUser } from "@/server/auth/require";
import { handle, json, readJson } from "@/server/http/respond";

export const dynamic = "force-dynamic";

const schema = z.object({
  password: z.string().min(1).max(200),
  signedEntryId: z.uuid(),
  signedHash: z.string().regex(/^[0-9a-f]{64}$/),
  meaning: z.enum(SIGNATURE_MEANINGS),
});

/**
 * Confirm a signature with the password (online): checked and throttled like a sign-in, answered
 * with a proof that covers this one signature of this user only.
 */
export async function POST(req: Request) {
  return handle(async () => {
    const user = await requireUser();
    const body = schema.safeParse(await readJson(req, 4_000));
    if (!body.success) throw new AppError("bad_request", "signature", "Send the password and what is being signed.");
    const db = await getDb();
    try {
      await verifySignIn(db, { email: user.email, password: body.data.password });
    } catch (e) {
      if (e instanceof SignInError) throw new AppError("forbidden", "signature", e.message);
      throw e;
    }
    const secrets = await signingSecrets(db, { userId: user.id });
    if (!secrets) throw new AppError("unauthorized", "session", "Sign in first.");
    const { password: _pw, ...subject } = body.data;
    return json({
      proof: hmacHex(passwordProofKey(secrets.passwordHash), signingMessage({ ...subject, signerId: user.id })),
    });
  });
}
