// Who is signed in (the tablet learns the user from this, never from a page's HTML).
import { json } from "@/server/http/respond";
import { route } from "@/server/http/route";

export const dynamic = "force-dynamic";

export const GET = route({ access: "signed-in", surface: "session", duringPasswordChange: true }, async ({ user }) =>
  json({ user }),
);
