import { requireUser } from "@/server/auth/require";
import { handle, json } from "@/server/http/respond";

export const dynamic = "force-dynamic";

export async function GET() {
  return handle(async () => json({ user: await requireUser() }));
}
