// Change your own password (the current one is needed, checked and limited like a sign-in). Open
// while a reset still requires the change; your other sessions end.
import { z } from "zod";
import { changeOwnPassword } from "@/server/auth/passwords";
import { json } from "@/server/http/respond";
import { route } from "@/server/http/route";

export const dynamic = "force-dynamic";

const body = z.object({
  currentPassword: z.string().min(1, "Enter your current password.").max(200),
  newPassword: z.string().min(1, "Enter a new password.").max(200, "Use at most 200 characters."),
});

export const POST = route(
  { access: "signed-in", surface: "password", body, maxBytes: 2_000, duringPasswordChange: true },
  async ({ db, user, sessionId, body: input }) => {
    await changeOwnPassword(db, user, sessionId, input);
    return json({ ok: true });
  },
);
